/** Events of one leg, in seconds on the session time base, sorted. */
export interface LegEvents {
  initialContactsS: number[];
  finalContactsS: number[];
  midSwingsS: number[];
}

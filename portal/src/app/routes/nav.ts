/** One entry of the role-aware navigation. `end` marks links that match only their exact path. */
export interface NavItem {
  to: string;
  label: string;
  end?: boolean;
}

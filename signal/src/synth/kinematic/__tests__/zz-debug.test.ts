import { it } from "vitest";
import { synthesizeKinematicSession } from "..";
it("dbg", () => {
  for (const o of [{ seed: 11 }, { seed: 21, bouts: [{ durationS: 60, strideTimeS: 3.0, romScale: 0.55 }], stanceFraction: 0.75 }, { seed: 17, bouts: [{ durationS: 60, strideTimeS: 1.0, romScale: 0.45 }], stanceFraction: 0.72 }]) {
    const s = synthesizeKinematicSession({ bouts: [{ durationS: 40 }], ...o, noise: { gyroDegS: 0 } });
    const H = 1.72;
    const ankle = (t: number) => {
      const [px] = s.model.pelvisPositionM(t);
      const th = (s.model.thighAngleDeg("left", t) * Math.PI) / 180;
      const sh = (s.model.shankAngleDeg("left", t) * Math.PI) / 180;
      return px + 0.245 * H * Math.sin(th) + 0.246 * H * Math.sin(sh);
    };
    const st = s.truth.left.strides[6]!;
    const prof: string[] = [];
    for (let i = 0; i <= 10; i++) {
      const t = st.icS + ((st.fcS - st.icS) * i) / 10;
      prof.push((ankle(t) - ankle(st.icS)).toFixed(3));
    }
    console.log("stride", st.strideLengthM.toFixed(3), "ankle travel over stance:", prof.join(" "), "swing travel", (ankle(st.nextIcS) - ankle(st.fcS)).toFixed(3));
  }
});

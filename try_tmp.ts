import { generateSyntheticPicks } from "@/lib/engine/synthetic";
import { fitPlane } from "@/lib/engine/plane";
import { projectToPlane } from "@/lib/engine/project";
import { displacementColumn } from "@/lib/engine/displacement";
import { inferTipLine } from "@/lib/engine/tipline";
import { triangulate } from "@/lib/engine/triangulate";
const cases: any[] = [];
let seed = 1;
for (const profile of ["walsh-watterson-1989", "elliptical-crack"] as const)
  for (const aspect of [1, 2, 3.5]) for (const dip of [30, 55, 80]) for (const strike of [20, 130, 250, 340]) {
    const cutoff = 5 + (seed % 3) * 5; const noise = 1 + (seed % 3);
    const dmax = profile === "elliptical-crack" ? cutoff * 1.8 / Math.sin(dip*Math.PI/180) : cutoff * 7 / Math.sin(dip*Math.PI/180);
    cases.push({ seed: seed++, profile, aspectRatio: aspect, dipDeg: dip, strikeDeg: strike, throwCutoffM: cutoff, noiseM: noise, dmaxM: dmax, halfLengthM: 1500 });
  }
let worst = 0;
for (const c of cases) {
  const { picks, truth } = generateSyntheticPicks(c);
  const pl = fitPlane(picks.x, picks.y, picks.z);
  const { s, t } = projectToPlane(picks.x, picks.y, picks.z, pl);
  const d = displacementColumn(picks.throwM, picks.heaveM, pl.dipDeg);
  const t0 = performance.now();
  const tri = triangulate(s, t); const outline: [number,number][] = tri.outline.map((v) => [s[v], t[v]]);
  const tip = inferTipLine(s, t, d, pl, { outline, spacingM: tri.medianEdgeM });
  let minS=Infinity,maxS=-Infinity; for (const v of s){minS=Math.min(minS,v);maxS=Math.max(maxS,v);}
  const eL = tip.lengthM / truth[0].lengthM - 1, eH = tip.heightM / truth[0].heightM - 1;
  worst = Math.max(worst, Math.abs(eL), Math.abs(eH));
  console.log(c.profile.slice(0,4), c.aspectRatio, c.dipDeg, c.strikeDeg, c.throwCutoffM, c.noiseM, picks.x.length, tip.model.slice(0,4), eL.toFixed(3), eH.toFixed(3), "mapped", ((maxS-minS)/truth[0].lengthM-1).toFixed(3), (performance.now()-t0).toFixed(0)+"ms");
}
console.log("worst", worst);

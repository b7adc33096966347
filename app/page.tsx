import Link from "next/link";
import { redirect } from "next/navigation";
import { getSessionUser } from "@/lib/auth/session";

const FEATURES = [
  { title: "Checked picks", text: "Upload throw picks as CSV. Every bad row is named with its column and reason; nothing is half-saved." },
  {
    title: "Displacement surface",
    text: "Best-fit fault plane, Delaunay triangulation, a gridded displacement surface and its contours, with the peak located.",
  },
  { title: "Inferred tip line", text: "Where displacement dies out below seismic resolution, fitted with published profile shapes and an honest uncertainty." },
  { title: "Fault sheet", text: "Length, height, aspect ratio, gradients, Dmax/L against published scaling, relays between overlapping segments." },
  { title: "Review together", text: "Pin comments to exact places on the surface, save viewpoints, share a read-only link to one fault." },
  { title: "CPU-friendly 3D", text: "Built to run on a laptop without a graphics card: decimated meshes, render on demand." },
];

export default async function LandingPage() {
  if (await getSessionUser()) redirect("/studies");
  return (
    <main>
      <section className="relative overflow-hidden border-b border-slate-200 dark:border-slate-800">
        <div
          aria-hidden
          className="absolute inset-0 [background:radial-gradient(ellipse_70%_60%_at_70%_10%,theme(colors.slip.100),transparent)] dark:[background:radial-gradient(ellipse_70%_60%_at_70%_10%,theme(colors.slip.950),transparent)]"
        />
        <div className="relative mx-auto grid max-w-6xl gap-10 px-6 py-20 md:grid-cols-[1.2fr_1fr] md:items-center">
          <div>
            <p className="eyebrow">For seismic interpreters and structural geologists</p>
            <h1 className="mt-3 text-4xl font-semibold leading-tight md:text-5xl">From scattered throw picks to the whole fault.</h1>
            <p className="mt-5 max-w-xl text-lg text-slate-600 dark:text-slate-300">
              Slipfield turns the throws you picked on a fault into a displacement surface, contours, the tip line beyond seismic resolution and the numbers
              that describe the fault — then lets your team review it in 3D and share exact views.
            </p>
            <div className="mt-8 flex gap-3">
              <Link href="/sign-up" className="btn-primary px-5 py-2.5">
                Create account
              </Link>
              <Link href="/sign-in" className="btn-quiet px-5 py-2.5">
                Sign in
              </Link>
            </div>
          </div>
          <BullsEye />
        </div>
      </section>
      <section className="mx-auto grid max-w-6xl gap-5 px-6 py-14 sm:grid-cols-2 lg:grid-cols-3">
        {FEATURES.map((feature) => (
          <div key={feature.title} className="card p-5">
            <h2 className="font-semibold">{feature.title}</h2>
            <p className="mt-2 text-sm text-slate-600 dark:text-slate-400">{feature.text}</p>
          </div>
        ))}
      </section>
      <footer className="mx-auto max-w-6xl px-6 pb-12 text-xs text-slate-500">
        Results are interpretations of seismic data. Decisions on injection, storage, drilling or well placement need site-specific study, local regulation and
        licensed professionals.
      </footer>
    </main>
  );
}

/** Decorative concentric displacement contours with an elliptical tip line. */
function BullsEye() {
  const levels = [0.92, 0.76, 0.6, 0.44, 0.28];
  return (
    <svg viewBox="-110 -60 220 120" className="w-full drop-shadow-sm" role="img" aria-label="Elliptical displacement contours">
      <defs>
        <radialGradient id="landing-field" cx="0.48" cy="0.45" r="0.55">
          <stop offset="0" stopColor="#fde725" />
          <stop offset="0.35" stopColor="#5ec962" />
          <stop offset="0.65" stopColor="#21918c" />
          <stop offset="1" stopColor="#3b528b" />
        </radialGradient>
      </defs>
      <ellipse cx="0" cy="0" rx="100" ry="48" fill="url(#landing-field)" opacity="0.9" />
      {levels.map((level) => (
        <ellipse
          key={level}
          cx={-6 * (1 - level)}
          cy={-3 * (1 - level)}
          rx={100 * level}
          ry={48 * level}
          fill="none"
          stroke="#0f172a"
          strokeOpacity="0.55"
          strokeWidth="0.6"
        />
      ))}
      <ellipse cx="0" cy="0" rx="100" ry="48" fill="none" stroke="#f5a524" strokeWidth="2.2" />
      <ellipse cx="-2" cy="-1" rx="84" ry="40" fill="none" stroke="#0f172a" strokeDasharray="3 2.5" strokeWidth="0.9" />
    </svg>
  );
}

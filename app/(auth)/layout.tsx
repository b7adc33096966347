export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <main className="relative flex min-h-[calc(100vh-3.5rem)] items-start justify-center overflow-hidden px-4 py-16">
      <div
        aria-hidden
        className="pointer-events-none absolute inset-0 opacity-60 [background:radial-gradient(ellipse_60%_45%_at_50%_0%,theme(colors.slip.100),transparent)] dark:[background:radial-gradient(ellipse_60%_45%_at_50%_0%,theme(colors.slip.950),transparent)]"
      />
      <div className="card relative w-full max-w-sm p-7">{children}</div>
    </main>
  );
}

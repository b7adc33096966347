import Link from "next/link";
import { getSessionUser } from "@/lib/auth/session";
import { outboxEnabled, ownsAnyStudy } from "@/lib/outbox";
import { signOutAction } from "@/app/(auth)/actions";
import { Logo } from "./Logo";
import { ThemeToggle } from "./ThemeToggle";

export async function SiteHeader() {
  const user = await getSessionUser();
  const showOutbox = user !== null && outboxEnabled() && (await ownsAnyStudy(user.id));
  const navLink = "rounded-md px-2.5 py-1.5 text-slate-600 hover:bg-slate-100 hover:text-slate-900 dark:text-slate-300 dark:hover:bg-slate-800";
  return (
    <header className="sticky top-0 z-30 border-b border-slate-200 bg-white/85 backdrop-blur dark:border-slate-800 dark:bg-slate-950/85">
      <div className="mx-auto flex h-14 max-w-[1600px] items-center gap-4 px-4">
        <Link href={user ? "/studies" : "/"} className="flex items-center gap-2 font-semibold">
          <Logo />
          <span className="text-lg">Slipfield</span>
        </Link>
        {user && (
          <nav className="ml-4 hidden gap-1 text-sm sm:flex">
            <Link href="/studies" className={navLink}>
              Studies
            </Link>
            <Link href="/settings" className={navLink} data-testid="nav-settings">
              E-mail settings
            </Link>
            {showOutbox && (
              <Link
                href="/outbox"
                className={navLink}
                data-testid="nav-outbox"
                title="E-mail Slipfield has written (kept on this machine when no mail server is configured)"
              >
                Outbox
              </Link>
            )}
          </nav>
        )}
        <div className="ml-auto flex items-center gap-2">
          <ThemeToggle />
          {user ? (
            <>
              <span className="hidden text-sm text-slate-600 dark:text-slate-400 md:inline" data-testid="signed-in-as">
                {user.name}
              </span>
              <form action={signOutAction}>
                <button type="submit" className="btn-quiet">
                  Sign out
                </button>
              </form>
            </>
          ) : (
            <>
              <Link href="/sign-in" className="btn-quiet">
                Sign in
              </Link>
              <Link href="/sign-up" className="btn-primary">
                Create account
              </Link>
            </>
          )}
        </div>
      </div>
    </header>
  );
}

import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { randomUUID } from "node:crypto";
import { checkCredentials } from "./users";
import { config } from "@/lib/config";

/** How long a session lasts without use (a signed-out session is refused until then, lib/auth/session.ts). */
export const SESSION_MAX_AGE_SECONDS = 7 * 24 * 3600;

class TooManyAttempts extends CredentialsSignin {
  code = "too_many_attempts";
}

export const { handlers, auth, signIn, signOut } = NextAuth({
  trustHost: true,
  logger: {
    // a wrong password is an everyday event, answered with a message on the form: not a server error with a stack
    error(error) {
      if (error.name === "CredentialsSignin" || (error as { type?: string }).type === "CredentialsSignin") return;
      console.error(`[auth] ${error.name}: ${error.message}`);
    },
  },
  secret: config().AUTH_SECRET,
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_SECONDS },
  pages: { signIn: "/sign-in" },
  providers: [
    Credentials({
      credentials: { email: { label: "E-mail" }, password: { label: "Password", type: "password" } },
      async authorize(credentials) {
        const result = await checkCredentials(credentials);
        if (result.ok) return result.user;
        if (result.reason === "rate-limited") throw new TooManyAttempts();
        return null;
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user?.id) {
        token.uid = user.id;
        // the session's own id, so that signing out can end it on every process (lib/auth/session.ts)
        token.sid = randomUUID();
      }
      return token;
    },
    session({ session, token }) {
      if (typeof token.uid === "string") session.user.id = token.uid;
      if (typeof token.sid === "string") (session as typeof session & { sessionId?: string }).sessionId = token.sid;
      return session;
    },
  },
});

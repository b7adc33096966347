import type { NextConfig } from "next";
import { config } from "./lib/config";

const settings = config();
const isProduction = settings.NODE_ENV === "production";

// CSP: no unsafe-eval in production; three.js and R3F need blob: workers only for drei helpers we don't use.
const contentSecurityPolicy = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isProduction ? "" : " 'unsafe-eval'"}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self' data:",
  "connect-src 'self'",
  "worker-src 'self' blob:",
  "frame-ancestors 'none'",
  "base-uri 'self'",
  "form-action 'self'",
].join("; ");

const nextConfig: NextConfig = {
  // A separate build folder for the hardening scripts and tests (scripts/hardening/server.ts), so their build and a
  // concurrent `npm run build` on the same checkout do not overwrite each other. Default: .next
  ...(settings.SLIPFIELD_DIST_DIR ? { distDir: settings.SLIPFIELD_DIST_DIR } : {}),
  serverExternalPackages: ["@electric-sql/pglite"],
  poweredByHeader: false,
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "Content-Security-Policy", value: contentSecurityPolicy },
          { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
        ],
      },
    ];
  },
};

export default nextConfig;

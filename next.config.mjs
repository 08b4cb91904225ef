import { PHASE_DEVELOPMENT_SERVER } from "next/constants.js";

/**
 * What a page may load: everything from this origin only, nothing may frame it. Next's inline bootstrap scripts and
 * the inline styles of next/font, uPlot and the mail preview need 'unsafe-inline'; the development server also
 * evaluates code and talks over a websocket.
 */
function contentSecurityPolicy(development) {
  return [
    "default-src 'self'",
    `script-src 'self' 'unsafe-inline'${development ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    `connect-src 'self'${development ? " ws:" : ""}`,
    "frame-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

/** @type {(phase: string) => import('next').NextConfig} */
const nextConfig = (phase) => ({
  poweredByHeader: false,
  // No gzip in the Node process: compressing every JSON answer cost the cycle lists about a tenth of their time on a
  // 2-core server (issue 12). Compression belongs to the reverse proxy in front (README, "Behind a reverse proxy").
  compress: false,
  reactStrictMode: true,
  experimental: {
    // Lets server pages answer a refused role with a real 403 (forbidden()) rather than a redirect.
    authInterrupts: true,
    // A day-long logger file is ~12 MB; actions that carry one need the headroom.
    serverActions: { bodySizeLimit: "55mb" },
  },
  async headers() {
    const everywhere = [
      { key: "X-Content-Type-Options", value: "nosniff" },
      { key: "Referrer-Policy", value: "same-origin" },
      { key: "X-Frame-Options", value: "DENY" },
    ];
    return [
      { source: "/:path*", headers: [...everywhere, { key: "Content-Security-Policy", value: contentSecurityPolicy(phase === PHASE_DEVELOPMENT_SERVER) }] },
      // Answers of the API (JSON, PDF, CSV) run no scripts; a page policy could stop the browser's PDF viewer.
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: "frame-ancestors 'none'" }] },
    ];
  },
});

export default nextConfig;

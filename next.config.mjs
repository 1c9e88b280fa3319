// Next.js configuration. Security headers that do not depend on the request live here; the
// Content-Security-Policy needs a per-request nonce and is set in proxy.ts.
/** @type {import('next').NextConfig} */
const securityHeaders = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
  // Always sent, whatever the build's environment: browsers ignore it over plain http (RFC 6797 §8.1),
  // so it costs the local demo nothing, and a deployment behind https can never ship without it.
  // One year, in seconds.
  { key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" },
];

const nextConfig = {
  // npm test builds into .next-test when a running `npm start` is serving an older .next.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  // `npm test` and CI type-check the whole project with `tsc --noEmit` as a stage of its own; the
  // build repeating it doubled the slowest step on a 2-core machine.
  typescript: { ignoreBuildErrors: true },
  experimental: {
    // A request that passes through proxy.ts has its body copied for the proxy, up to this size
    // (Next's default is 10 MiB, twice over: the copy and the replay). No route that proxy.ts sees
    // takes more than 512 KiB (draft saves); uploads and sign-in skip the proxy. Bytes: 1 MiB.
    // Each route still cuts its own body at its own limit (lib/http/body.ts).
    proxyClientMaxBodySize: 1024 * 1024,
  },
  reactStrictMode: true,
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders }];
  },
};

export default nextConfig;

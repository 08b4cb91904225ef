/** @type {import('next').NextConfig} */
const nextConfig = {
  poweredByHeader: false,
  reactStrictMode: true,
  experimental: {
    // Lets server pages answer a refused role with a real 403 (forbidden()) rather than a redirect.
    authInterrupts: true,
    // A day-long logger file is ~12 MB; actions that carry one need the headroom.
    serverActions: { bodySizeLimit: "55mb" },
  },
};

export default nextConfig;

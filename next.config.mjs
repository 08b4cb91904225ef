/** @type {import('next').NextConfig} */
const nextConfig = {
  poweredByHeader: false,
  reactStrictMode: true,
  // Logger files of a whole day are ~12 MB; uploads go through route handlers, but server actions
  // that carry a file need the same headroom.
  experimental: { serverActions: { bodySizeLimit: "55mb" } },
};

export default nextConfig;

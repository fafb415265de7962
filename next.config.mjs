/** @type {import('next').NextConfig} */
const nextConfig = {
  // exifr loads fs/zlib dynamically; bundling it breaks file reads on the server.
  serverExternalPackages: ["exifr"],
  poweredByHeader: false,
};

export default nextConfig;

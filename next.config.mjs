/** @type {import('next').NextConfig} */
const nextConfig = {
  serverExternalPackages: ['sequelize', 'pg', 'pg-hstore'],
  poweredByHeader: false,
  experimental: { turbopackFileSystemCacheForBuild: false },
};
export default nextConfig;

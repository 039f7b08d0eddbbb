import type { NextConfig } from 'next';

const nextConfig: NextConfig = {
  // PGlite ships its own WebAssembly and data files; bundling them breaks the first query.
  serverExternalPackages: ['@electric-sql/pglite'],
  // A separate output folder lets a test run build beside a developer's own build.
  distDir: process.env.NEXT_DIST_DIR || '.next',
  // The benchmark builds only to measure; `npm run typecheck` and CI judge the types.
  typescript: { ignoreBuildErrors: process.env.NEXT_BUILD_SKIP_TYPECHECK === '1' },
  poweredByHeader: false,
  typedRoutes: false,
  async headers() {
    return [
      {
        source: '/:path*',
        headers: [
          { key: 'X-Content-Type-Options', value: 'nosniff' },
          { key: 'Referrer-Policy', value: 'same-origin' },
          { key: 'X-Frame-Options', value: 'DENY' },
        ],
      },
    ];
  },
};

export default nextConfig;

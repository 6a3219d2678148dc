import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // pdfkit (inside pdfmake) reads its font metrics via __dirname; bundling breaks that.
  serverExternalPackages: ["pdfmake", "better-sqlite3", "exceljs"],
  poweredByHeader: false,
  experimental: { serverActions: { bodySizeLimit: "20mb" } },
};

export default nextConfig;

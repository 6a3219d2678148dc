import type { NextConfig } from "next";
import { UPLOAD_BODY_LIMIT_BYTES } from "./app/schemas";

const nextConfig: NextConfig = {
  // pdfkit (inside pdfmake) reads its font metrics via __dirname; bundling breaks that.
  serverExternalPackages: ["pdfmake", "better-sqlite3", "exceljs"],
  poweredByHeader: false,
  // The upload's own limit (MAX_UPLOAD_BYTES, 20 MB) is checked in the browser and by the upload action with a plain
  // message; the body limit sits 1 MB above it so a file at the limit is never cut off here with a bare error.
  experimental: { serverActions: { bodySizeLimit: UPLOAD_BODY_LIMIT_BYTES } },
};

export default nextConfig;

import type { NextConfig } from "next";
import { UPLOAD_BODY_LIMIT_BYTES } from "./app/schemas";

const nextConfig: NextConfig = {
  // pdfkit (inside pdfmake) reads its font metrics via __dirname; bundling breaks that.
  serverExternalPackages: ["pdfmake", "better-sqlite3", "exceljs"],
  poweredByHeader: false,
  // The upload's own limit (MAX_UPLOAD_BYTES, 20 MB) is checked in the browser and by the upload action with a plain
  // message; the body limit sits 1 MB above it so a file at the limit is never cut off here with a bare error.
  experimental: { serverActions: { bodySizeLimit: UPLOAD_BODY_LIMIT_BYTES } },
  // No page of the app may be framed by another (clickjacking of the sign form), a download is never sniffed into
  // something else, and no address leaves with a link to another site (OWASP cheat sheets on clickjacking and headers,
  // recalled). "same-origin", not "no-referrer": with no referrer a browser sends "Origin: null" on a plain form post,
  // and the server-action origin check refuses it.
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "Content-Security-Policy", value: "frame-ancestors 'none'" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "X-Content-Type-Options", value: "nosniff" },
          { key: "Referrer-Policy", value: "same-origin" },
        ],
      },
    ];
  },
};

export default nextConfig;

// Local ESLint rule: `lib/` layers import downwards only, and nothing in `lib/` imports `app/`,
// React or Next. The allowed map is the architecture (DEVELOPERS.md, "Layers").
import path from "node:path";

/** layer → layers it may import (besides itself). */
export const ALLOWED = {
  core: [],
  units: ["core"],
  numeric: ["core"],
  breath: ["core", "units"],
  signal: ["core", "units", "numeric", "breath"],
  synthetic: ["core", "units", "numeric", "breath"],
  thresholds: ["core", "units", "numeric", "breath", "signal"],
  predicted: ["core", "units", "numeric"],
  interpret: ["core", "units", "numeric", "predicted"],
  analysis: ["core", "units", "numeric", "breath", "signal", "thresholds", "predicted", "interpret", "synthetic"],
  report: ["core", "units", "numeric", "breath", "signal", "thresholds", "predicted", "interpret", "analysis"],
  store: [
    "core",
    "units",
    "numeric",
    "breath",
    "signal",
    "thresholds",
    "predicted",
    "interpret",
    "analysis",
    "report",
    "synthetic",
  ],
};

const UI_PACKAGES = /^(react|react-dom|next)(\/|$)/;

function layerOf(file, root) {
  const rel = path.relative(root, file).split(path.sep);
  return rel[0] === "lib" && rel.length > 2 ? rel[1] : null;
}

export default {
  meta: { type: "problem", messages: { layer: "{{msg}}" }, schema: [] },
  create(context) {
    const file = context.filename;
    const root = context.cwd;
    const from = layerOf(file, root);
    if (!from) return {};
    function check(node, spec) {
      if (typeof spec !== "string") return;
      if (UI_PACKAGES.test(spec)) {
        context.report({
          node,
          messageId: "layer",
          data: { msg: `lib/${from} must not import ${spec}: lib/ is pure TypeScript with no React or Next` },
        });
        return;
      }
      let target = null;
      if (spec.startsWith(".")) target = path.resolve(path.dirname(file), spec);
      else if (spec.startsWith("@/")) target = path.resolve(root, spec.slice(2));
      else return;
      const rel = path.relative(root, target).split(path.sep);
      if (rel[0] === "app" || rel[0] === "cli") {
        context.report({ node, messageId: "layer", data: { msg: `lib/${from} must not import ${rel[0]}/` } });
        return;
      }
      if (rel[0] !== "lib") return;
      const to = rel[1];
      if (to === from) return;
      const allowed = ALLOWED[from];
      if (!allowed) {
        context.report({
          node,
          messageId: "layer",
          data: { msg: `lib/${from} is not a known layer; add it to eslint-rules/layers.mjs` },
        });
      } else if (!allowed.includes(to)) {
        context.report({
          node,
          messageId: "layer",
          data: {
            msg: `lib/${from} may not import lib/${to} (layers import downwards only: ${from} → ${allowed.join(", ") || "nothing"})`,
          },
        });
      }
    }
    return {
      ImportDeclaration: (n) => check(n, n.source.value),
      ExportNamedDeclaration: (n) => n.source && check(n, n.source.value),
      ExportAllDeclaration: (n) => check(n, n.source.value),
      ImportExpression: (n) => n.source.type === "Literal" && check(n, n.source.value),
    };
  },
};

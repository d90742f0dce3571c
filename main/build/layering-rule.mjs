// ESLint rule `layline/layering`: which folder may import what.
//
//   shared/    shared/ and pure packages; no electron, no Node built-ins, no DOM-only packages
//   main/      shared/, main/, Node built-ins, electron, packages
//   renderer/  shared/, renderer/, browser packages; no electron, no Node built-ins
//   test/      anything
// The table is the whole policy: there is no per-file exemption list.
import { builtinModules } from 'node:module';
import path from 'node:path';

const NODE_BUILTINS = new Set(builtinModules.flatMap((m) => [m, `node:${m}`]));
/** Packages that need a DOM or a window and so have no place in shared/. */
const DOM_ONLY_PACKAGES = new Set(['preact', 'chart.js', 'playwright-core']);

const ALLOWED_LAYERS = {
  shared: new Set(['shared']),
  main: new Set(['shared', 'main']),
  renderer: new Set(['shared', 'renderer']),
};

function layerOf(repoRoot, file) {
  const rel = path.relative(repoRoot, file).split(path.sep);
  return rel.length > 1 && rel[0] !== '..' ? rel[0] : null;
}

function packageName(source) {
  const parts = source.split('/');
  return source.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0];
}

export function layeringRule(repoRoot) {
  return {
    meta: {
      type: 'problem',
      docs: { description: 'Enforce Layline layering between shared/, main/ and renderer/' },
      schema: [],
      messages: {
        layer: "{{from}}/ may not import from {{to}}/ ('{{source}}'); see DEVELOPERS.md, Layering.",
        builtin: "{{from}}/ may not import the Node built-in '{{source}}'; Node code belongs in main/.",
        electron: "{{from}}/ may not import 'electron'; Electron code belongs in main/.",
        domPackage: "shared/ may not import the browser-only package '{{source}}'; it must run in Node, a worker and a page.",
      },
    },
    create(context) {
      const file = context.filename ?? context.getFilename();
      const from = layerOf(repoRoot, file);
      const allowed = from ? ALLOWED_LAYERS[from] : undefined;
      if (!allowed) return {};

      function check(node, source) {
        if (typeof source !== 'string') return;
        if (source.startsWith('.') || path.isAbsolute(source)) {
          const target = layerOf(repoRoot, path.resolve(path.dirname(file), source));
          if (target === null || !allowed.has(target)) {
            context.report({ node, messageId: 'layer', data: { from, to: target ?? 'outside the source tree', source } });
          }
          return;
        }
        if (NODE_BUILTINS.has(source) || NODE_BUILTINS.has(packageName(source)) || source.startsWith('node:')) {
          if (from !== 'main') context.report({ node, messageId: 'builtin', data: { from, source } });
          return;
        }
        if (packageName(source) === 'electron') {
          if (from !== 'main') context.report({ node, messageId: 'electron', data: { from, source } });
          return;
        }
        if (from === 'shared' && DOM_ONLY_PACKAGES.has(packageName(source))) {
          context.report({ node, messageId: 'domPackage', data: { source } });
        }
      }
      const fromSource = (node) => check(node, node.source?.value);
      return {
        ImportDeclaration: fromSource,
        ExportNamedDeclaration: fromSource,
        ExportAllDeclaration: fromSource,
        ImportExpression: (node) => check(node, node.source.type === 'Literal' ? node.source.value : undefined),
        TSImportEqualsDeclaration: (node) =>
          node.moduleReference.type === 'TSExternalModuleReference' && check(node, node.moduleReference.expression.value),
        TSImportType: (node) => check(node, node.argument?.literal?.value ?? node.argument?.value),
        CallExpression: (node) => {
          if (node.callee.type === 'Identifier' && node.callee.name === 'require' && node.arguments[0]?.type === 'Literal') {
            check(node, node.arguments[0].value);
          }
        },
      };
    },
  };
}

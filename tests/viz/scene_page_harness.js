// Runs the page's viewer against a stand-in DOM and WebGL context; counts the draw calls.
const fs = require('fs');
const page = fs.readFileSync(process.argv[2], 'utf8');
const data = page.match(/<script type="application\/json" id="scene-data">([\s\S]*?)<\/script>/)[1];
const viewer = page.match(/<script>([\s\S]*?)<\/script>\s*<\/body>/)[1];
let draws = 0, triangles = 0, failures = [];
const gl = new Proxy({}, { get(t, k) {
  if (k === 'drawElements') return (mode, count) => { draws++; triangles += count / 3; };
  if (k === 'getShaderParameter' || k === 'getProgramParameter') return () => true;
  if (k === 'getExtension') return () => ({});
  if (typeof k === 'string' && k === k.toUpperCase()) return 1;
  return (...args) => { for (const a of args) if (typeof a === 'number' && !isFinite(a)) failures.push(k); return {}; };
}});
const handlers = {};
const canvas = { getContext: () => gl, clientWidth: 800, clientHeight: 500, width: 0, height: 0,
  addEventListener: (n, f) => { handlers[n] = f; } };
global.devicePixelRatio = 1;
global.window = { addEventListener: (n, f) => { handlers['w' + n] = f; } };
const buttons = [];
global.document = {
  getElementById: id => id === 'scene-data' ? { textContent: data } : canvas,
  querySelectorAll: () => buttons, body: { insertAdjacentHTML() {} } };
eval(viewer);
const first = draws;
handlers.mousedown({clientX: 10, clientY: 10});
handlers.wmousemove({clientX: 60, clientY: 30});
// where the camera's focal point and a point beside it land on the screen (normalized coordinates)
function ndc(m, p) { const v = [0, 0, 0, 0];
  for (let r = 0; r < 4; r++) v[r] = m[r] * p[0] + m[4 + r] * p[1] + m[8 + r] * p[2] + m[12 + r];
  return [v[0] / v[3], v[1] / v[3], v[2] / v[3]]; }
const c = JSON.parse(data).cameras.hitter;
const M = matrix(c.position, c.focal, [0, 0, 1], c.fov, 1.6);
const centre = ndc(M, c.focal), above = ndc(M, [c.focal[0], c.focal[1], c.focal[2] + 1]);
const left = ndc(M, [c.focal[0], c.focal[1] + 1, c.focal[2]]);
console.log(JSON.stringify({first, after: draws, triangles, failures: failures.length,
  centre, above, left, meshes: JSON.parse(data).meshes.length}));

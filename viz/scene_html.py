"""A scene as one self-contained HTML page: the meshes, a small WebGL viewer and the legend.

The page needs no network, no plug-in and no Python: open it in a web browser. Drag to turn the
view about the court, scroll to come closer, and pick a camera preset from its buttons. The
meshes are the scene's own (:func:`viz.scene.build_scene`): triangles with their normals and the
colour and opacity of each mesh, coordinates in the court frame rounded to the millimetre.
"""

from __future__ import annotations

import html
import json

import numpy as np

_VIEWER = r"""
const D = JSON.parse(document.getElementById('scene-data').textContent);
const cv = document.getElementById('view');
const gl = cv.getContext('webgl', {antialias: true});
if (!gl) { document.body.insertAdjacentHTML('beforeend', '<p>This browser has no WebGL.</p>'); }
const vs = `attribute vec3 p; attribute vec3 n; uniform mat4 M; uniform vec3 eye;
  varying vec3 vn; varying vec3 vp;
  void main(){ vn = n; vp = p; gl_Position = M * vec4(p, 1.0); }`;
const fs = `precision mediump float; varying vec3 vn; varying vec3 vp;
  uniform vec3 eye; uniform vec4 colour;
  void main(){ vec3 l = normalize(eye - vp); vec3 nn = normalize(vn);
    float d = abs(dot(nn, l)); float sky = 0.5 + 0.5 * nn.z;
    vec3 c = colour.rgb * (0.42 + 0.45 * d + 0.13 * sky);
    gl_FragColor = vec4(min(c, vec3(1.0)), colour.a); }`;
function shader(type, src){ const s = gl.createShader(type); gl.shaderSource(s, src);
  gl.compileShader(s); return s; }
const prog = gl.createProgram();
gl.attachShader(prog, shader(gl.VERTEX_SHADER, vs));
gl.attachShader(prog, shader(gl.FRAGMENT_SHADER, fs));
gl.linkProgram(prog); gl.useProgram(prog);
const aP = gl.getAttribLocation(prog, 'p'), aN = gl.getAttribLocation(prog, 'n');
const uM = gl.getUniformLocation(prog, 'M'), uC = gl.getUniformLocation(prog, 'colour');
const uE = gl.getUniformLocation(prog, 'eye');
const ext = gl.getExtension('OES_element_index_uint');
const meshes = D.meshes.map(m => {
  const pb = gl.createBuffer(); gl.bindBuffer(gl.ARRAY_BUFFER, pb);
  gl.bufferData(gl.ARRAY_BUFFER, new Float32Array(m.points), gl.STATIC_DRAW);
  const nb = gl.createBuffer(); gl.bindBuffer(gl.ARRAY_BUFFER, nb);
  gl.bufferData(gl.ARRAY_BUFFER, new Float32Array(m.normals), gl.STATIC_DRAW);
  const ib = gl.createBuffer(); gl.bindBuffer(gl.ELEMENT_ARRAY_BUFFER, ib);
  gl.bufferData(gl.ELEMENT_ARRAY_BUFFER, new Uint32Array(m.triangles), gl.STATIC_DRAW);
  return {pb, nb, ib, count: m.triangles.length, colour: m.colour, opacity: m.opacity};
});
function sub(a, b){ return [a[0]-b[0], a[1]-b[1], a[2]-b[2]]; }
function cross(a, b){ return [a[1]*b[2]-a[2]*b[1], a[2]*b[0]-a[0]*b[2], a[0]*b[1]-a[1]*b[0]]; }
function unit(a){ const l = Math.hypot(a[0], a[1], a[2]) || 1; return [a[0]/l, a[1]/l, a[2]/l]; }
function dot(a, b){ return a[0]*b[0] + a[1]*b[1] + a[2]*b[2]; }
function matrix(eye, focal, up, fov, aspect){
  const f = unit(sub(focal, eye)), s = unit(cross(f, up)), u = cross(s, f);
  const view = [s[0], u[0], -f[0], 0, s[1], u[1], -f[1], 0, s[2], u[2], -f[2], 0,
                -dot(s, eye), -dot(u, eye), dot(f, eye), 1];
  const t = 1 / Math.tan(fov * Math.PI / 360), near = 0.1, far = 400;
  const proj = [t / aspect, 0, 0, 0, 0, t, 0, 0, 0, 0, (far + near) / (near - far), -1,
                0, 0, 2 * far * near / (near - far), 0];
  const out = new Array(16).fill(0);
  for (let c = 0; c < 4; c++) for (let r = 0; r < 4; r++) for (let k = 0; k < 4; k++)
    out[c*4 + r] += proj[k*4 + r] * view[c*4 + k];
  return out;
}
let cam = null;
function preset(name){
  const c = D.cameras[name]; const off = sub(c.position, c.focal);
  const dist = Math.hypot(off[0], off[1], off[2]);
  cam = {focal: c.focal.slice(), dist, az: Math.atan2(off[1], off[0]),
         el: Math.asin(off[2] / dist), fov: c.fov, top: name === 'overhead'};
  draw();
}
function eyeOf(){ return [cam.focal[0] + cam.dist * Math.cos(cam.el) * Math.cos(cam.az),
                         cam.focal[1] + cam.dist * Math.cos(cam.el) * Math.sin(cam.az),
                         cam.focal[2] + cam.dist * Math.sin(cam.el)]; }
function draw(){
  const w = cv.clientWidth, h = cv.clientHeight;
  cv.width = w * devicePixelRatio; cv.height = h * devicePixelRatio;
  gl.viewport(0, 0, cv.width, cv.height);
  gl.clearColor(1, 1, 1, 1); gl.clear(gl.COLOR_BUFFER_BIT | gl.DEPTH_BUFFER_BIT);
  gl.enable(gl.DEPTH_TEST);
  const eye = eyeOf(); const up = cam.el > 1.45 ? [0, 1, 0] : [0, 0, 1];
  gl.uniformMatrix4fv(uM, false, new Float32Array(matrix(eye, cam.focal, up, cam.fov, w / h)));
  gl.uniform3fv(uE, eye);
  for (const pass of [0, 1]) {
    gl.depthMask(pass === 0);
    if (pass === 1) { gl.enable(gl.BLEND); gl.blendFunc(gl.SRC_ALPHA, gl.ONE_MINUS_SRC_ALPHA); }
    for (const m of meshes) {
      if ((m.opacity < 1) !== (pass === 1)) continue;
      gl.uniform4f(uC, m.colour[0], m.colour[1], m.colour[2], m.opacity);
      gl.bindBuffer(gl.ARRAY_BUFFER, m.pb); gl.enableVertexAttribArray(aP);
      gl.vertexAttribPointer(aP, 3, gl.FLOAT, false, 0, 0);
      gl.bindBuffer(gl.ARRAY_BUFFER, m.nb); gl.enableVertexAttribArray(aN);
      gl.vertexAttribPointer(aN, 3, gl.FLOAT, false, 0, 0);
      gl.bindBuffer(gl.ELEMENT_ARRAY_BUFFER, m.ib);
      gl.drawElements(gl.TRIANGLES, m.count, gl.UNSIGNED_INT, 0);
    }
    gl.disable(gl.BLEND);
  }
  gl.depthMask(true);
}
let drag = null;
cv.addEventListener('mousedown', e => { drag = [e.clientX, e.clientY]; });
window.addEventListener('mouseup', () => { drag = null; });
window.addEventListener('mousemove', e => {
  if (!drag) return;
  cam.az -= (e.clientX - drag[0]) * 0.006;
  cam.el = Math.min(1.55, Math.max(0.02, cam.el + (e.clientY - drag[1]) * 0.006));
  drag = [e.clientX, e.clientY]; draw();
});
cv.addEventListener('wheel', e => { e.preventDefault();
  cam.dist = Math.min(150, Math.max(3, cam.dist * Math.exp(e.deltaY * 0.001))); draw(); },
  {passive: false});
window.addEventListener('resize', draw);
for (const b of document.querySelectorAll('button[data-camera]'))
  b.addEventListener('click', () => preset(b.dataset.camera));
preset(D.start);
"""

_PAGE = """<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>{title}</title>
<style>
  body {{ margin: 0; font: 14px/1.4 sans-serif; color: #222; background: #fff; }}
  header {{ padding: 8px 12px; border-bottom: 1px solid #ddd; }}
  header h1 {{ font-size: 16px; margin: 0 0 4px 0; }}
  #view {{ width: 100vw; height: calc(100vh - 150px); display: block; cursor: grab; }}
  .keys span {{ display: inline-block; margin-right: 14px; }}
  .swatch {{ display: inline-block; width: 12px; height: 12px; margin-right: 5px;
            vertical-align: -1px; border: 1px solid #555; }}
  button {{ margin-right: 6px; }}
  footer {{ padding: 4px 12px; color: #555; font-size: 12px; }}
</style>
</head>
<body>
<header>
<h1>{title}</h1>
<div class="keys">{legend}</div>
<div>camera: {buttons} &nbsp; drag to turn, scroll to zoom</div>
</header>
<canvas id="view"></canvas>
<footer>{markers}</footer>
<script type="application/json" id="scene-data">{data}</script>
<script>{viewer}</script>
</body>
</html>
"""


def _normals(points, faces):
    """Vertex normals: the area-weighted sum of the normals of the triangles at each vertex."""
    a, b, c = (points[faces[:, k]] for k in range(3))
    face_normals = np.cross(b - a, c - a)
    normals = np.zeros_like(points)
    for k in range(3):
        np.add.at(normals, faces[:, k], face_normals)
    length = np.linalg.norm(normals, axis=1, keepdims=True)
    return np.divide(normals, length, out=np.zeros_like(normals), where=length > 0)


def _meshes(plotter):
    """Triangles, normals, colour and opacity of every 3D mesh in the plotter."""
    out = []
    for actor in plotter.actors.values():
        mapper = getattr(actor, "mapper", None)
        dataset = getattr(mapper, "dataset", None) if mapper is not None else None
        if dataset is None or not hasattr(actor, "prop"):
            continue
        surface = dataset.extract_surface(algorithm="dataset_surface").triangulate()
        if surface.n_cells == 0:
            continue
        faces = surface.faces.reshape(-1, 4)[:, 1:]
        points = np.asarray(surface.points, float)
        out.append(
            {
                "points": np.round(points, 3).ravel().tolist(),
                "normals": np.round(_normals(points, faces), 3).ravel().tolist(),
                "triangles": faces.ravel().astype(int).tolist(),
                "colour": [round(float(v), 4) for v in actor.prop.color.float_rgb],
                "opacity": round(float(actor.prop.opacity), 3),
            }
        )
    return out


def page(plotter, title, legend, markers, cameras, start, view_angle=38.0):
    """The HTML text of a scene.

    Parameters
    ----------
    plotter : pyvista.Plotter with the scene's meshes.
    title : str
    legend : list of (label, hex colour)
    markers : str, the meaning of the marker shapes
    cameras : {name: (position, focal point, view up)}
    start : the camera preset shown first
    """
    data = {
        "meshes": _meshes(plotter),
        "cameras": {
            name: {"position": list(p), "focal": list(f), "fov": view_angle}
            for name, (p, f, _) in cameras.items()
        },
        "start": start,
    }
    legend_html = "".join(
        f'<span><span class="swatch" style="background:{html.escape(c)}"></span>'
        f"{html.escape(label)}</span>"
        for label, c in legend
    )
    buttons = "".join(
        f'<button data-camera="{html.escape(n)}">{html.escape(n)}</button>' for n in cameras
    )
    text = json.dumps(data, separators=(",", ":")).replace("</", "<\\/")
    return _PAGE.format(
        title=html.escape(title),
        legend=legend_html,
        buttons=buttons,
        markers=html.escape(markers),
        data=text,
        viewer=_VIEWER,
    )

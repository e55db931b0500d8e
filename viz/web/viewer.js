// rallyarc's 3D view: the court, the shots' paths as unlit tubes in the palette's colours,
// orbit / pan / zoom by mouse and touch, camera presets, and a tap or hover on a path shows
// that shot's numbers. three.js is inlined in the page as text and loaded from a blob URL.
const moduleUrl = (text) => URL.createObjectURL(new Blob([text], {type: 'text/javascript'}));
const threeUrl = moduleUrl(document.getElementById('three-module').textContent);
const THREE = await import(threeUrl);
const orbitText = document.getElementById('three-orbit').textContent
  .replace(/from\s*['"]three['"]/, `from '${threeUrl}'`);
const {OrbitControls} = await import(moduleUrl(orbitText));

function decodePath(b64) {
  const bytes = Uint8Array.from(atob(b64), (c) => c.charCodeAt(0));
  const q = new Int16Array(bytes.buffer);
  const out = [];
  for (let k = 0; k + 2 < q.length; k += 3) out.push(new THREE.Vector3(q[k] / 1000, q[k + 1] / 1000, q[k + 2] / 1000));
  return out;
}

function flat(colour, extra = {}) {
  return new THREE.MeshBasicMaterial({color: new THREE.Color(colour), ...extra});
}

function addCourt(scene, c) {
  const col = c.colours;
  const plane = (w, h, z, colour, extra) => {
    const m = new THREE.Mesh(new THREE.PlaneGeometry(w, h), flat(colour, extra));
    m.position.z = z; scene.add(m); return m;
  };
  plane(2 * c.half_length + 60, 2 * c.half_width + 60, -0.006, col.ground);
  plane(2 * c.half_length + 12.8, 2 * c.half_width + 7.3, -0.004, col.surround);
  plane(2 * c.half_length, 2 * c.half_width, -0.002, col.surface);
  const lineMat = flat(col.line, {polygonOffset: true, polygonOffsetFactor: -2, polygonOffsetUnits: -2});
  for (const [x0, y0, x1, y1] of c.lines) {
    const along = x0 !== x1;
    const len = along ? Math.abs(x1 - x0) : Math.abs(y1 - y0);
    // each line is one quad a little longer than its centre line, so corners close
    const g = new THREE.PlaneGeometry(along ? len + c.line_width : c.line_width, along ? c.line_width : len + c.line_width);
    const m = new THREE.Mesh(g, lineMat);
    m.position.set((x0 + x1) / 2, (y0 + y1) / 2, 0.001);
    m.renderOrder = 1; scene.add(m);
  }
  // the net: a sheet from the ground to its top, the band along the cord, the posts
  const n = c.net_y.length, pos = [], idx = [];
  for (let k = 0; k < n; k++) pos.push(0, c.net_y[k], 0, 0, c.net_y[k], c.net_top[k]);
  for (let k = 0; k + 1 < n; k++) idx.push(2 * k, 2 * k + 2, 2 * k + 1, 2 * k + 1, 2 * k + 2, 2 * k + 3);
  const sheet = new THREE.BufferGeometry();
  sheet.setAttribute('position', new THREE.Float32BufferAttribute(pos, 3)); sheet.setIndex(idx);
  scene.add(new THREE.Mesh(sheet, flat(col.net, {transparent: true, opacity: 0.45, side: THREE.DoubleSide, depthWrite: false})));
  const cord = c.net_y.map((y, k) => new THREE.Vector3(0, y, c.net_top[k] - 0.025));
  scene.add(new THREE.Mesh(new THREE.TubeGeometry(new THREE.CatmullRomCurve3(cord), 80, 0.03, 6), flat(col.net_band)));
  for (const y of [c.post_y, -c.post_y]) {
    const post = new THREE.Mesh(new THREE.CylinderGeometry(0.05, 0.05, c.post_height, 10), flat(col.net));
    post.rotation.x = Math.PI / 2; post.position.set(0, y, c.post_height / 2); scene.add(post);
  }
}

function addShots(scene, data) {
  const r = data.ball_radius, many = data.many;
  return data.shots.map((s) => {
    const pts = decodePath(s.path);
    const group = new THREE.Group();
    if (pts.length >= 2) {
      const curve = new THREE.CatmullRomCurve3(pts, false, 'centripetal');
      const tube = new THREE.TubeGeometry(curve, Math.max(8, pts.length), many ? 0.02 : 0.045, many ? 4 : 8);
      group.add(new THREE.Mesh(tube, flat(s.colour)));
      if (!many) {
        const ball = new THREE.Mesh(new THREE.SphereGeometry(2.2 * r, 16, 10), flat(s.colour));
        ball.position.copy(pts[0]); group.add(ball);
      }
    }
    if (!many && s.land && s.land[0] !== null) {
      const disc = new THREE.Mesh(new THREE.CircleGeometry(5 * r, 24), flat(s.colour, {polygonOffset: true, polygonOffsetFactor: -4, polygonOffsetUnits: -4}));
      disc.position.set(s.land[0], s.land[1], 0.004); disc.renderOrder = 2; group.add(disc);
    }
    scene.add(group);
    return {shot: s, pts};
  });
}

function escapeText(t) {
  return String(t).replace(/[&<>"]/g, (ch) => ({'&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;'}[ch]));
}

function setUp(root, data) {
  const canvas = root.querySelector('.view3d-canvas');
  const panel = root.querySelector('.view3d-panel');
  const renderer = new THREE.WebGLRenderer({canvas, antialias: true, preserveDrawingBuffer: true});
  renderer.setPixelRatio(Math.min(2, window.devicePixelRatio || 1));
  renderer.outputColorSpace = THREE.SRGBColorSpace;
  const scene = new THREE.Scene();
  scene.background = new THREE.Color('#ffffff');
  const camera = new THREE.PerspectiveCamera(data.fov, 1, 0.1, 400);
  camera.up.set(0, 0, 1);
  addCourt(scene, data.court);
  const paths = addShots(scene, data);
  const controls = new OrbitControls(camera, canvas);
  controls.enableDamping = false;
  controls.maxDistance = 150; controls.minDistance = 2;
  const marker = new THREE.Mesh(new THREE.SphereGeometry(0.09, 16, 10), flat('#222222'));
  marker.visible = false; scene.add(marker);
  const render = () => renderer.render(scene, camera);
  const resize = () => {
    const w = canvas.clientWidth, h = canvas.clientHeight;
    if (!w || !h) return;
    renderer.setSize(w, h, false); camera.aspect = w / h; camera.updateProjectionMatrix(); render();
  };
  const preset = (name) => {
    const c = data.cameras[name];
    camera.position.set(...c.position); controls.target.set(...c.target);
    controls.update(); render();
    for (const b of root.querySelectorAll('button[data-camera]')) b.setAttribute('aria-pressed', String(b.dataset.camera === name));
  };
  controls.addEventListener('change', render);
  new ResizeObserver(resize).observe(canvas);
  for (const b of root.querySelectorAll('button[data-camera]')) b.addEventListener('click', () => preset(b.dataset.camera));

  // picking in screen space: the path passing nearest the pointer, within a finger's width
  const screen = (p) => {
    const v = p.clone().project(camera), rect = canvas.getBoundingClientRect();
    return [rect.left + (v.x + 1) / 2 * rect.width, rect.top + (1 - v.y) / 2 * rect.height, v.z];
  };
  const nearest = (x, y, reach) => {
    let best = null;
    for (const [k, path] of paths.entries()) {
      let prev = null;
      for (const [j, p] of path.pts.entries()) {
        const s = screen(p);
        if (prev && s[2] < 1 && prev[2] < 1) {
          const dx = s[0] - prev[0], dy = s[1] - prev[1], l2 = dx * dx + dy * dy || 1;
          const t = Math.max(0, Math.min(1, ((x - prev[0]) * dx + (y - prev[1]) * dy) / l2));
          const d = Math.hypot(prev[0] + t * dx - x, prev[1] + t * dy - y);
          if (d <= reach && (!best || d < best.d)) best = {d, k, j};
        }
        prev = s;
      }
    }
    return best;
  };
  const show = (hit) => {
    if (!hit) { panel.hidden = true; marker.visible = false; render(); return; }
    const {shot} = paths[hit.k];
    marker.position.copy(paths[hit.k].pts[hit.j]); marker.visible = true;
    const rows = shot.numbers.map((n) => `<tr data-key="${escapeText(n.key)}"><th>${escapeText(n.label)}</th><td>${escapeText(n.text)}</td></tr>`).join('');
    panel.innerHTML = `<div class="view3d-title"><span class="swatch" style="background:${escapeText(shot.colour)}"></span>` +
      `<b>${escapeText(shot.label)}</b> <span class="view3d-shot">shot ${shot.index + 1}, ${escapeText(shot.outcome)}</span></div><table>${rows}</table>`;
    panel.dataset.shot = String(shot.index);
    panel.hidden = false; render();
  };
  let down = null;
  canvas.addEventListener('pointerdown', (e) => { down = [e.clientX, e.clientY]; });
  canvas.addEventListener('pointerup', (e) => {
    if (down && Math.hypot(e.clientX - down[0], e.clientY - down[1]) < 6) show(nearest(e.clientX, e.clientY, e.pointerType === 'mouse' ? 10 : 22));
    down = null;
  });
  let pending = false;
  canvas.addEventListener('pointermove', (e) => {
    if (e.pointerType !== 'mouse' || e.buttons || pending) return;
    pending = true;
    requestAnimationFrame(() => { pending = false; const hit = nearest(e.clientX, e.clientY, 8); if (hit) show(hit); });
  });
  resize(); preset(data.start);
  // for scripts driving the page: where a shot's path is on screen (client pixels)
  root.rallyarcView = {
    pointOf: (shotIndex, fraction) => {
      const path = paths.find((p) => p.shot.index === shotIndex);
      const j = Math.min(path.pts.length - 1, Math.round(fraction * (path.pts.length - 1)));
      const s = screen(path.pts[j]); return {x: s[0], y: s[1]};
    },
    camera: () => camera.position.toArray(),
    preset,
  };
  root.dataset.ready = 'true';
}

for (const root of document.querySelectorAll('figure.view3d')) {
  const data = JSON.parse(root.nextElementSibling.textContent);
  setUp(root, data);
}

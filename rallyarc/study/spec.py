"""Study files: a base stroke or pattern pair, parameters over ranges, and how to sample them.

A study file (TOML, schema ``"studies"`` in :mod:`rallyarc.config`) names its ``kind``:

``shots``
    one whole shot per design point: the ``stroke`` (a preset or file) in the conditions of the
    ``scenario`` (its incoming ball, or the serve's own toss), with swing or incoming-ball
    parameters set to the point's values (:data:`rallyarc.sweep.PARAMETERS`).
``rallies``
    ``rallies`` rallies per design point (a pattern variant) of the ``patterns`` pair, with
    ``scatter`` (a factor on every execution scatter) set to the point's value; ``max_shots``
    caps a rally's length (default: the pattern file's).

``design`` is ``grid`` (every combination of ``steps`` evenly spaced values from ``low`` to
``high``), ``random`` (``samples`` points, each parameter drawn on its own) or ``latin``
(``samples`` points of a Latin hypercube: each parameter's range cut into ``samples`` equal
strata, one point in each). A ``normal`` distribution has its mean in the middle of the range
and its SD a quarter of it, values clipped to the range.

Every random number comes from the study ``seed``: the design from streams of its own, each
chunk's rallies from the chunk's stream (:func:`chunk_stream`), so that a chunk's results depend
on the study file only, never on which worker plays it or how many there are.
"""

from __future__ import annotations

import hashlib
import math
from dataclasses import dataclass

import numpy as np

from rallyarc import config
from rallyarc.errors import InputError

#: Shots per chunk and rallies per chunk when the study file gives no ``chunk``.
DEFAULT_CHUNK = {"shots": 20_000, "rallies": 2_000}
#: Design points drawn together from one design stream (any chunking gives the same points).
DESIGN_BLOCK = 4096
#: Most points of a Latin hypercube (each chunk re-derives the strata permutation of every
#: parameter, so its cost grows with the number of samples).
MOST_LATIN = 1_000_000
#: Most chunks of one study (the manifest lists each finished one).
MOST_CHUNKS = 1_000_000
#: Spawn keys of the design streams; a chunk's own stream has the one-element key ``(chunk,)``.
_DESIGN_KEY, _LATIN_KEY = 2**32 - 1, 2**32 - 2
_SUFFIX = {"km/h": "kmh", "deg": "deg", "rpm": "rpm", "x": "factor"}
#: Parameters of rally studies: name -> (label, unit, low, high).
RALLY_PARAMETERS = {"scatter": ("execution scatter factor", "x", 0.0, 5.0)}


@dataclass(frozen=True)
class StudyParameter:
    """One varied parameter: display-unit range, steps of a grid, distribution, SI scale."""

    name: str
    label: str
    unit: str
    low: float
    high: float
    steps: int
    distribution: str
    scale: float
    family: str

    @property
    def column(self):
        """Its column in the dataset, named with its unit (``head_speed_kmh``)."""
        return f"{self.name}_{_SUFFIX[self.unit]}"

    def from_unit(self, u):
        """Values in display units for numbers ``u`` in [0, 1)."""
        span = self.high - self.low
        if self.distribution == "normal":
            from scipy.special import ndtri

            mid = 0.5 * (self.low + self.high)
            return np.clip(
                mid + 0.25 * span * ndtri(np.clip(u, 1e-12, 1 - 1e-12)), self.low, self.high
            )
        return self.low + span * u

    def grid(self):
        return np.linspace(self.low, self.high, self.steps)


@dataclass(frozen=True)
class Study:
    """A loaded study: what is played, the parameters, the design and its chunks."""

    name: str
    kind: str
    design: str
    seed: int
    chunk: int
    parameters: tuple
    points: int
    rallies: int
    scheduler: str | None
    where: str
    fingerprint: str
    base: object  # shots: (stroke, conditions, incoming or None); rallies: (patterns, limit)

    @property
    def modes(self):
        """The physics modes every point plays that are not the defaults, in words
        (:attr:`rallyarc.domain.Conditions.modes`)."""
        if self.kind == "rallies":
            return self.base[0].players[0].conditions.modes
        return self.base[1].modes

    @property
    def blocks(self):
        """Chunks per design point (rallies) or 1 (shots)."""
        return -(-self.rallies // self.chunk) if self.kind == "rallies" else 1

    @property
    def n_chunks(self):
        if self.kind == "rallies":
            return self.points * self.blocks
        return -(-self.points // self.chunk)

    @property
    def total(self):
        """Whole shots (shot studies) or rallies (rally studies) in the study."""
        return self.points * (self.rallies if self.kind == "rallies" else 1)

    def chunk_size(self, k):
        """Shots or rallies of chunk ``k``."""
        if self.kind == "rallies":
            b = k % self.blocks
            return min(self.chunk, self.rallies - b * self.chunk)
        return min(self.chunk, self.points - k * self.chunk)


def chunk_stream(study, k):
    """The random stream of chunk ``k``: the ``k``-th child of the study seed."""
    return np.random.SeedSequence(study.seed, spawn_key=(int(k),))


def design_values(study, start, stop):
    """Display-unit values of every parameter for design points ``start`` to ``stop - 1``."""
    idx = np.arange(start, stop)
    params = study.parameters
    if study.design == "grid":
        cells = np.unravel_index(idx, [p.steps for p in params])
        return {p.column: p.grid()[c] for p, c in zip(params, cells, strict=True)}
    u = _unit_draws(study, start, stop)
    if study.design == "latin":
        for d in range(len(params)):
            rng = np.random.default_rng(
                np.random.SeedSequence(study.seed, spawn_key=(_LATIN_KEY, d))
            )
            strata = rng.permutation(study.points)[idx]
            u[:, d] = (strata + u[:, d]) / study.points
    return {p.column: p.from_unit(u[:, d]) for d, p in enumerate(params)}


def _unit_draws(study, start, stop):
    """Uniform numbers in [0, 1), one row per design point, drawn block by block."""
    dims = len(study.parameters)
    first, last = start // DESIGN_BLOCK, (stop - 1) // DESIGN_BLOCK
    parts = []
    for b in range(first, last + 1):
        seq = np.random.SeedSequence(study.seed, spawn_key=(_DESIGN_KEY, b))
        parts.append(np.random.default_rng(seq).random((DESIGN_BLOCK, dims)))
    lo = start - first * DESIGN_BLOCK
    return np.concatenate(parts)[lo : lo + stop - start].copy()


def load_study(name_or_path):
    """Read and check a study file (a preset name in ``configs/studies/`` or a path)."""
    data = config.load("studies", name_or_path)
    where, kind = data["where"], data["kind"]
    params = tuple(_parameter(p, kind, where, i + 1) for i, p in enumerate(data["parameters"]))
    names = [p.name for p in params]
    if len(set(names)) != len(names):
        raise InputError(f"{where}: key 'parameters': each parameter may be given once")
    design = data["design"]
    if design == "grid":
        for i, p in enumerate(params):
            if p.steps < 1:
                raise InputError(
                    f"{where}: key 'parameters[{i + 1}].steps' is needed by the grid design "
                    "(a whole number from 1 to 10000)"
                )
        points = math.prod(p.steps for p in params)
        if "samples" in data:
            raise InputError(f"{where}: key 'samples' is for the random and latin designs")
    else:
        if "samples" not in data:
            raise InputError(f"{where}: missing key 'samples' (the {design} design's points)")
        points = data["samples"]
        if design == "latin" and points > MOST_LATIN:
            raise InputError(
                f"{where}: key 'samples' must be a whole number from 1 to {MOST_LATIN} for the "
                f"latin design, got {points}"
            )
    base, rallies = _base(data, kind, params, where)
    chunk = data.get("chunk", DEFAULT_CHUNK[kind])
    study = Study(
        name=data["name"],
        kind=kind,
        design=design,
        seed=data["seed"],
        chunk=chunk,
        parameters=params,
        points=int(points),
        rallies=rallies,
        scheduler=data.get("scheduler"),
        where=where,
        fingerprint="",
        base=base,
    )
    if study.n_chunks > MOST_CHUNKS:
        raise InputError(
            f"{where}: the study has {study.n_chunks} chunks, more than {MOST_CHUNKS}; "
            "make key 'chunk' larger or the design smaller"
        )
    return _fingerprinted(study, data)


def _parameter(p, kind, where, i):
    key = f"parameters[{i}]"
    if kind == "shots":
        from rallyarc.sweep import PARAMETERS

        allowed = {n: q for n, q in PARAMETERS.items() if q.family in ("swing", "incoming")}
        if p["name"] not in allowed:
            raise InputError(
                f"{where}: key '{key}.name' must be one of {', '.join(allowed)}, got {p['name']!r}"
            )
        q = allowed[p["name"]]
        label, unit, low, high, scale, family = q.label, q.unit, q.low, q.high, q.scale, q.family
    else:
        if p["name"] not in RALLY_PARAMETERS:
            raise InputError(
                f"{where}: key '{key}.name' must be one of {', '.join(RALLY_PARAMETERS)}, "
                f"got {p['name']!r}"
            )
        label, unit, low, high = RALLY_PARAMETERS[p["name"]]
        scale, family = 1.0, "patterns"
    for end in ("low", "high"):
        if not low <= p[end] <= high:
            raise InputError(
                f"{where}: key '{key}.{end}' must be a number from {low:g} to {high:g} "
                f"({p['name']} [{unit}]), got {p[end]:g}"
            )
    if p["low"] > p["high"]:
        raise InputError(f"{where}: key '{key}.low' must not exceed '{key}.high'")
    return StudyParameter(
        p["name"],
        label,
        unit,
        p["low"],
        p["high"],
        p.get("steps", 0),
        p.get("distribution", "uniform"),
        scale,
        family,
    )


def _base(data, kind, params, where):
    """What every point plays: shots (stroke, conditions, incoming) or rallies (patterns)."""
    keys = {"shots": ("scenario", "stroke"), "rallies": ("patterns", "rallies")}[kind]
    other = {"shots": ("patterns", "rallies", "max_shots"), "rallies": ("scenario", "stroke")}[kind]
    for key in keys:
        if key not in data:
            raise InputError(f"{where}: missing key {key!r} (needed by a {kind} study)")
    for key in other:
        if key in data:
            raise InputError(
                f"{where}: key {key!r} is for a {'shots' if kind == 'rallies' else 'rallies'} study"
            )
    modes = {
        "friction_only": data.get("friction_only", False),
        "deforming_ball": data.get("deforming_ball", True),
    }
    if kind == "rallies":
        from rallyarc.rally.patterns import load_patterns, with_modes

        patterns = with_modes(config.referenced(data, "patterns", load_patterns), **modes)
        return (patterns, data.get("max_shots", int(patterns.max_shots))), data["rallies"]
    from dataclasses import replace

    from rallyarc import domain

    scenario = config.referenced(data, "scenario", domain.load_scenario)
    scenario = replace(scenario, conditions=replace(scenario.conditions, **modes))
    stroke = config.referenced(data, "stroke", domain.load_stroke)
    incoming = None
    if stroke.kind == "serve":
        for p in params:
            if p.family == "incoming":
                raise InputError(
                    f"{where}: parameter {p.name!r} varies the incoming ball, but a serve "
                    "meets its own toss"
                )
    elif scenario.incoming is None:
        raise InputError(f"{where}: key 'scenario': {scenario.where} has no [incoming] table")
    else:
        incoming = tuple(np.asarray(a, float) for a in domain.incoming_state(scenario.incoming))
    return (stroke, scenario.conditions, incoming), 1


def _fingerprinted(study, data):
    """The study with the fingerprint of everything its results depend on (the checked keys
    without the scheduler, and the loaded presets)."""
    from dataclasses import replace

    keys = {k: v for k, v in data.items() if k not in ("where", "scheduler", "description")}
    text = repr((sorted(keys.items()), study.chunk, repr(study.base), "rallyarc-study-1"))
    return replace(study, fingerprint=hashlib.sha256(text.encode()).hexdigest())

#!/usr/bin/env python3
"""Independent textbook model that writes field readings for fillpace's tests.

INVENTED DATA GENERATOR, written for the tests only and independently of
fillpace's engine (it shares no code and no method of solution with it):

* vertical stress increments under the embankment from the 2-D elastic
  (plane strain) solution of a linearly varying strip load, i.e. Flamant's
  line load integrated over each linear piece of the fill surface (the form
  given by Poulos & Davis 1974; Osterberg 1957 is the centreline special case
  and is used as a self-check);
* each lift is a horizontal layer of the final section (toe at the final toe);
  the excess pore pressure generated is the vertical stress increment (1-D);
* dissipation by Carrillo's (1942) combination U = 1 - (1 - Uv)(1 - Uh) of
  Terzaghi's vertical solution (uniform initial excess, double drainage,
  series in z/H) and Hansbo's (1981) radial solution with smear and well
  resistance, superposed over the load increments;
* settlement from e-log(sigma') (Cr up to sigma'p, Cc beyond) over sublayers,
  each increment's final settlement times the sublayer's degree of
  consolidation for that increment, superposed;
* toe marker: lateral movement = a stated ratio x the centreline settlement
  (order of magnitude from Tavenas et al. 1979).

Pure Python 3.11 standard library. See tests/truth/README.md for the
approximations, the parameters and the commands that made the committed files.
"""

import argparse
import datetime as dt
import math
import os
import random
import sys
import tomllib

GAMMA_W = 9.81  # unit weight of water, kN/m3
DAYS_PER_YEAR = 365.25
SUBLAYER_M = 0.25  # sublayer thickness for settlement, m
STEP_DAYS = 0.25  # a ramp of the fill record is applied in steps of at most this, days
FILL_ID = "fill"
HEADER = "instrument,time,value"

# As-built crest height (m above original ground) of the existing demo
# readings' `fill` rows; linear between points.
DEMO_FILL = (
    "2027-04-05T07:00=0.0,2027-04-20T17:00=2.5,2027-05-05T07:00=2.5,"
    "2027-05-19T17:00=5.0,2027-06-03T07:00=5.0,2027-06-07T17:00=5.75"
)
DEMO_END = "2027-07-05T09:00"

# Standard deviation of the reading noise per instrument kind, in SI
# (kPa, m, m). Common practice for vibrating-wire piezometers, precise
# levelling of plate rods and taping to a reference pin.
PRECISION_SI = {"piezometer": 1.0, "settlement-plate": 0.003, "lateral-marker": 0.002}

# Tavenas et al. (1979) report lateral movement of the order of 0.1-0.2 of
# the centreline settlement once the clay consolidates (value from memory).
DEFAULT_LATERAL_RATIO = 0.16


class InputError(Exception):
    """A project or option value this model cannot use."""


# --------------------------------------------------------------------------
# Elastic stresses (plane strain)


def _f0(u, z):
    """Integral of Flamant's kernel 2 z^3 / (pi (u^2 + z^2)^2) over u."""
    return (math.atan2(u, z) + u * z / (u * u + z * z)) / math.pi


def _f1(u, z):
    """Integral of u times Flamant's kernel over u."""
    return -(z**3) / (math.pi * (u * u + z * z))


def sigma_z(load, x0, z):
    """Vertical stress increment (kPa) at (x0, z>0) under a strip load that is
    piecewise linear in x: `load` = [(x, q kPa)] with x ascending."""
    s = 0.0
    for (x1, q1), (x2, q2) in zip(load, load[1:]):
        if x2 - x1 < 1e-12:
            continue
        b = (q2 - q1) / (x2 - x1)
        a = q1 - b * x1
        u1, u2 = x1 - x0, x2 - x0
        s += (a + b * x0) * (_f0(u2, z) - _f0(u1, z)) + b * (_f1(u2, z) - _f1(u1, z))
    return s


def osterberg_factor(a, b, z):
    """Osterberg's (1957) influence factor under the edge of the crest of a
    half embankment (slope width a, half crest b); the centreline stress of
    the whole embankment is 2 I q."""
    a1 = math.atan((a + b) / z) - math.atan(b / z)
    a2 = math.atan(b / z)
    return ((a + b) / a * (a1 + a2) - b / a * a2) / math.pi


# --------------------------------------------------------------------------
# Embankment geometry


def design_section(emb):
    """Half section at design height: [(x, y)] from the centreline to the toe."""
    n = emb["side_slope_h_per_v"]
    x, y = 0.5 * emb["crest_width_m"], emb["design_height_m"]
    pts = [(0.0, y), (x, y)]
    for berm in emb.get("berms", []):
        hb = berm["height_m"]
        if hb >= y:
            continue
        x += n * (y - hb)
        pts.append((x, hb))
        x += berm["width_m"]
        pts.append((x, hb))
        y = hb
    pts.append((x + n * y, 0.0))
    return pts


def _interp(pts, x):
    if x >= pts[-1][0]:
        return 0.0
    for (x1, y1), (x2, y2) in zip(pts, pts[1:]):
        if x <= x2:
            return y1 if x2 == x1 else y1 + (y2 - y1) * (x - x1) / (x2 - x1)
    return 0.0


def stage_surface(emb, h):
    """Fill surface height at crest height h: the design section cut at h;
    above the design height (surcharge) the crest platform at h with the
    side slope down until it meets the design section. Returns y(x)."""
    sec = design_section(emb)
    hd, b, n = emb["design_height_m"], 0.5 * emb["crest_width_m"], emb["side_slope_h_per_v"]

    def y(x):
        x = abs(x)
        base = min(_interp(sec, x), h)
        if h > hd:
            base = max(base, h - max(x - b, 0.0) / n, 0.0)
        return base

    return y, sec


def stage_load(emb, h):
    """Strip load [(x, q kPa)] of the fill at crest height h (whole width)."""
    if h <= 0.0:
        return []
    y, sec = stage_surface(emb, h)
    gamma = emb["fill_unit_weight_kn_m3"]
    n = emb["side_slope_h_per_v"]
    b = 0.5 * emb["crest_width_m"]
    toe = max(sec[-1][0], b + n * h)
    xs = {0.0, toe, b, b + n * h}
    for (x1, y1), (x2, y2) in zip(sec, sec[1:]):
        xs.update((x1, x2))
        if (y1 - h) * (y2 - h) < 0.0:  # the level h crosses this piece
            xs.add(x1 + (x2 - x1) * (h - y1) / (y2 - y1))
        if h > emb["design_height_m"] and x2 > x1:  # surcharge slope meets it
            s_piece, s_line = (y2 - y1) / (x2 - x1), -1.0 / n
            if abs(s_piece - s_line) > 1e-12:
                xc = (h + b / n - (y1 - s_piece * x1)) / (s_piece - s_line)
                if x1 < xc < x2:
                    xs.add(xc)
    half = sorted(x for x in xs if 0.0 <= x <= toe)
    full = [-x for x in reversed(half[1:])] + half
    return [(x, gamma * y(x)) for x in full]


# --------------------------------------------------------------------------
# Consolidation


def terzaghi_uz(zr, tv):
    """Terzaghi's excess ratio u/u0 at depth ratio zr = z/H (0..2, double
    drainage, H the drainage path) for a uniform initial excess at time
    factor tv: Fourier series for tv >= 0.05, image (erfc) series below."""
    if tv <= 0.0:
        return 0.0 if zr <= 0.0 or zr >= 2.0 else 1.0
    if tv < 0.05:
        s, r = 2.0 * math.sqrt(tv), 0.0
        for k in range(8):
            r += (-1) ** k * (math.erfc((2 * k + zr) / s) + math.erfc((2 * (k + 1) - zr) / s))
        return 1.0 - r
    u, m = 0.0, 0
    while True:
        mm = math.pi * (2 * m + 1) / 2.0
        term = 2.0 / mm * math.sin(mm * zr) * math.exp(-mm * mm * tv)
        u += term
        if mm * mm * tv > 40.0:
            return u
        m += 1


def terzaghi_average(tv):
    """Terzaghi's average degree of consolidation Uv at time factor tv."""
    s, m = 0.0, 0
    while True:
        mm = math.pi * (2 * m + 1) / 2.0
        s += 2.0 / (mm * mm) * math.exp(-mm * mm * tv)
        if mm * mm * tv > 40.0 or m > 20000:
            return 1.0 - s
        m += 1


def hansbo_mu(n, s, kh_over_ks, z, l, kh_over_qw):
    """Hansbo's (1981) mu with smear and well resistance: n = de/dw,
    s = ds/dw, z depth from the drain's discharging end, l its drainage
    length, kh/qw in 1/m^2."""
    return math.log(n / s) + kh_over_ks * math.log(s) - 0.75 + math.pi * z * (2 * l - z) * kh_over_qw


def hansbo_uh(th, mu):
    """Hansbo's (1981) average degree of radial consolidation at Th = ch t / de^2."""
    return 1.0 - math.exp(-8.0 * th / mu)


def carrillo(uv, uh):
    """Carrillo's (1942) combined degree of consolidation."""
    return 1.0 - (1.0 - uv) * (1.0 - uh)


# --------------------------------------------------------------------------
# Ground


def _clay_stratum(ground):
    """The clay layers from the ground surface down to the first layer that
    is not clay, as (top m, bottom m, layer); and whether that next layer
    drains (sand or gravel) so the stratum drains at its base."""
    top, clays, below = 0.0, [], None
    for layer in ground["layers"]:
        if layer["kind"] != "clay":
            below = layer
            break
        clays.append((top, top + layer["thickness_m"], layer))
        top += layer["thickness_m"]
    if not clays:
        raise InputError("[ground.layers]: no clay layer at the ground surface; this model needs one")
    for layer in ground["layers"][len(clays) :]:
        if layer["kind"] == "clay":
            raise InputError(f"[ground.layers] `{layer['name']}`: clay below a drained layer is not modelled")
    drains_at_base = below is not None and below["kind"] in ("sand", "gravel")
    drains_at_base = drains_at_base or ground.get("base_drainage") == "drained"
    return clays, drains_at_base


def sigma_v0(ground, z):
    """Initial total vertical stress (kPa) at depth z below original ground."""
    zw, s, top = ground["groundwater_depth_m"], 0.0, 0.0
    for layer in ground["layers"]:
        t = layer.get("thickness_m", math.inf)
        bot = top + t
        dry = max(0.0, min(bot, zw, z) - top)
        wet = max(0.0, min(bot, z) - max(top, zw))
        s += dry * layer["unit_weight_kn_m3"] + wet * layer.get("saturated_unit_weight_kn_m3", layer["unit_weight_kn_m3"])
        if z <= bot:
            return s
        top = bot
    return s


def u_hydrostatic(ground, z):
    """Hydrostatic pore pressure (kPa) at depth z below original ground."""
    return GAMMA_W * max(0.0, z - ground["groundwater_depth_m"])


class Stratum:
    """Clay sublayers with their initial state and consolidation properties."""

    def __init__(self, project, rate, compress):
        ground, self.emb = project["ground"], project["embankment"]
        clays, double = _clay_stratum(ground)
        self.ground, self.bottom = ground, clays[-1][1]
        self.rate, self.compress = rate, compress
        self.ref = max(clays, key=lambda c: c[1] - c[0])[2]  # the thickest clay layer
        self.cv_ref = self.ref["cv_m2_per_year"] * rate / DAYS_PER_YEAR  # m2/day
        self.clays = clays
        thick_eq = sum((b - t) * self._cv_scale(lay) for t, b, lay in clays)
        self.h_dr = thick_eq / 2.0 if double else thick_eq
        self.drain = Drains(project, self.bottom, below_drains=double)
        self.subs = []
        for top, bot, lay in clays:
            n = max(1, round((bot - top) / SUBLAYER_M))
            for j in range(n):
                self.subs.append(self._sublayer(top + (j + 0.5) * (bot - top) / n, (bot - top) / n, lay))

    def _cv_scale(self, lay):
        """Transformed-thickness factor sqrt(cv_ref / cv) of a clay layer."""
        return math.sqrt(self.ref["cv_m2_per_year"] / lay["cv_m2_per_year"])

    def z_ratio(self, z):
        """Depth z (m) as z'/H in the transformed (equal-cv) stratum."""
        zt = 0.0
        for top, bot, lay in self.clays:
            zt += (min(z, bot) - top) * self._cv_scale(lay)
            if z <= bot:
                break
        return zt / self.h_dr

    def layer_at(self, z):
        for top, bot, lay in self.clays:
            if top <= z <= bot:
                return lay
        return None

    def _sublayer(self, z, dz, lay):
        sv0 = sigma_v0(self.ground, z) - u_hydrostatic(self.ground, z)
        if "pop_kpa" in lay:
            sp = sv0 + lay["pop_kpa"]
        elif "ocr" in lay:
            sp = sv0 * lay["ocr"]
        else:
            raise InputError(f"layer `{lay['name']}`: needs pop_kpa or ocr for sigma'p")
        ch = lay["cv_m2_per_year"] * lay.get("ch_over_cv", 1.0) * self.rate / DAYS_PER_YEAR
        cc, cr = lay["cc"] * self.compress, lay["cr"] * self.compress
        s_ref = sv0 + self.emb["fill_unit_weight_kn_m3"] * self.emb["design_height_m"]
        mv = cc / math.log(10.0) / ((1.0 + lay["e0"]) * s_ref)
        return {
            "z": z, "dz": dz, "sv0": sv0, "sp": max(sp, sv0), "e0": lay["e0"], "cc": cc, "cr": cr,
            "ch": ch, "zr": self.z_ratio(z), "mu": self.drain.mu(z, ch * mv * GAMMA_W * DAYS_PER_YEAR),
        }

    def point(self, z):
        """Consolidation properties at a point (a piezometer tip)."""
        lay = self.layer_at(z)
        if lay is None:
            return None
        return self._sublayer(z, 0.0, lay)


def strain(sub, s):
    """1-D strain of a sublayer from sigma'v0 to sigma' = s (e-log, Cr up to
    sigma'p, Cc beyond)."""
    s0, sp = sub["sv0"], sub["sp"]
    e = sub["cr"] * math.log10(min(s, sp) / s0) + sub["cc"] * math.log10(max(s, sp) / sp)
    return e / (1.0 + sub["e0"])


class Drains:
    """Prefabricated vertical drains: equivalent diameters and Hansbo's mu."""

    def __init__(self, project, clay_bottom, below_drains):
        d = project.get("drains")
        self.present = d is not None
        if not self.present:
            return
        factor = {"triangular": 1.05, "square": 1.128}.get(d["pattern"])
        if factor is None:
            raise InputError(f"[drains] pattern = \"{d['pattern']}\": allowed triangular, square")
        self.de = factor * d["spacing_m"]
        # Hansbo (1979): equivalent diameter of a band drain 2 (a + b) / pi.
        self.dw = 2.0 * (d["band_width_mm"] + d["band_thickness_mm"]) / 1000.0 / math.pi
        self.depth = d["depth_m"]
        self.s, self.kh_ks = d.get("smear_ratio", 1.0), d.get("kh_over_ks", 1.0)
        self.qw = d.get("discharge_m3_per_year", math.inf)
        # Drains reaching the drained base discharge at both ends.
        self.two_ends = below_drains and self.depth >= clay_bottom - 1e-9
        self.l = self.depth / 2.0 if self.two_ends else self.depth

    def mu(self, z, kh_m_per_year):
        """Hansbo's mu at depth z; None below the drains."""
        if not self.present or z > self.depth:
            return None
        zz = min(z, self.depth - z) if self.two_ends else z
        return hansbo_mu(self.de / self.dw, self.s, self.kh_ks, zz, self.l, kh_m_per_year / self.qw)


# --------------------------------------------------------------------------
# Load history and the response of one vertical line


def increments(fill):
    """Load steps (day applied, crest height before, after) from a fill
    record [(day, height)], linear between points: each ramp is split into
    equal steps of at most STEP_DAYS applied at the middle of each step."""
    steps = []
    for (t0, h0), (t1, h1) in zip(fill, fill[1:]):
        if h1 < h0 - 1e-12:
            raise InputError(f"fill record: height falls from {h0} m to {h1} m; unloading is not modelled")
        if h1 - h0 <= 1e-12:
            continue
        n = max(1, math.ceil((t1 - t0) / STEP_DAYS))
        for j in range(n):
            steps.append((t0 + (j + 0.5) * (t1 - t0) / n, h0 + (h1 - h0) * j / n, h0 + (h1 - h0) * (j + 1) / n))
    return steps


class Column:
    """Stresses, excess pore pressure and settlement on the vertical line at
    offset x (m) from the centreline."""

    def __init__(self, stratum, x, steps, tips):
        self.st, self.steps, self.tips = stratum, steps, tips
        emb = stratum.emb
        loads = {h: stage_load(emb, h) for st in steps for h in st[1:]}

        def dsig(z):
            return [sigma_z(loads[h1], x, z) - sigma_z(loads[h0], x, z) for _, h0, h1 in steps]

        self.sub_ds = []  # per sublayer: final settlement (m) of each step
        for sub in stratum.subs:
            ds, s_prev, acc = [], sub["sv0"], sub["sv0"]
            for d in dsig(sub["z"]):
                acc += d
                ds.append(sub["dz"] * (strain(sub, acc) - strain(sub, s_prev)))
                s_prev = acc
            self.sub_ds.append(ds)
        self.tip_props = {d: stratum.point(d) for d in tips}
        self.tip_dsig = {d: dsig(d) for d in tips}
        self._cache = {}

    def excess_ratio(self, prop, dt_days):
        """Carrillo's u/u0 = (u/u0)_vertical (1 - Uh) at a point, dt after a step."""
        tv = self.st.cv_ref * dt_days / self.st.h_dr**2
        uv_ratio = terzaghi_uz(prop["zr"], tv)
        if prop["mu"] is None:
            return uv_ratio
        th = prop["ch"] * dt_days / self.st.drain.de**2
        return uv_ratio * (1.0 - hansbo_uh(th, prop["mu"]))

    def settlement(self, t, below=0.0):
        """Settlement (m) at day t of the clay below depth `below` (0: the
        ground surface), each step's final settlement times the sublayer's
        degree of consolidation for that step."""
        if t not in self._cache:
            self._cache[t] = [
                sum(dsi * (1.0 - self.excess_ratio(sub, t - ti)) for (ti, _, _), dsi in zip(self.steps, ds) if ti < t)
                for sub, ds in zip(self.st.subs, self.sub_ds)
            ]
        return sum(v for sub, v in zip(self.st.subs, self._cache[t]) if sub["z"] >= below)

    def excess(self, t, d):
        """Excess pore pressure (kPa) at depth d, day t."""
        prop = self.tip_props[d]
        if prop is None:  # a drained layer
            return 0.0
        return sum(dsi * self.excess_ratio(prop, t - ti) for (ti, _, _), dsi in zip(self.steps, self.tip_dsig[d]) if ti < t)


# --------------------------------------------------------------------------
# Instruments and the readings file

TO_SI = {"kPa": 1.0, "m-head": GAMMA_W, "m": 1.0, "mm": 0.001}
DECIMALS = {"kPa": 1, "m-head": 2, "m": 3, "mm": 1}  # as a field sheet records them


def parse_time(text):
    return dt.datetime.fromisoformat(text.strip())


def parse_fill(text, start):
    """`TIME=HEIGHT,...` to [(day, height m)] with days from the project start."""
    out = []
    for item in text.split(","):
        t, _, h = item.partition("=")
        out.append(((parse_time(t) - start).total_seconds() / 86400.0, float(h), parse_time(t)))
    if out[0][1] != 0.0:
        raise InputError("--fill: the record must begin with height 0")
    return out


def instrument_value(inst, prj, cols, t, args):
    """Reading (instrument units) of an instrument at day t: the model's,
    plus the injected anomaly when `--distress-from` is given."""
    kind, unit = inst["kind"], inst["units"]
    if kind == "piezometer":
        col, d = cols[inst["offset_m"]], inst["depth_m"]
        s_tip = col.settlement(t, below=d) if not args.no_tip_settlement else 0.0
        u = u_hydrostatic(prj["ground"], d + s_tip) + excess_with_distress(col, d, t, args)
        return u / TO_SI[unit]
    if kind == "settlement-plate":
        return inst["baseline_value"] - cols[inst["offset_m"]].settlement(t) / TO_SI[unit]
    if kind == "lateral-marker":
        move = args.lateral_ratio * cols[0.0].settlement(t)
        if args.distress_day is not None and t > args.distress_day:
            move += 0.5 * args.lateral_accel_mm_per_day2 * (t - args.distress_day) ** 2 / 1000.0
        return inst["baseline_value"] + move / TO_SI[unit]
    raise InputError(f"[[instrument]] {inst['id']}: kind = \"{kind}\" is not modelled")


def excess_with_distress(col, d, t, args):
    """Excess pore pressure (kPa); an injected anomaly (not modelled) from
    `--distress-from`: dissipation stops and the excess rises at a constant
    net rate."""
    if args.distress_day is None or t <= args.distress_day:
        return col.excess(t, d)
    return col.excess(args.distress_day, d) + args.pore_rise_kpa_per_week * (t - args.distress_day) / 7.0


def build_columns(prj, args, steps):
    stratum = Stratum(prj, args.rate, args.compressibility)
    offsets = {0.0: []}
    for inst in prj.get("instrument", []):
        if inst["units"] not in TO_SI:
            raise InputError(f"[[instrument]] {inst['id']}: units = \"{inst['units']}\" not modelled")
        tips = offsets.setdefault(float(inst.get("offset_m", 0.0)), [])
        if inst["kind"] == "piezometer":
            tips.append(inst["depth_m"])
    return {x: Column(stratum, x, steps, tips) for x, tips in offsets.items()}


def reading_times(prj, args):
    first = min(i["baseline_date"] for i in prj["instrument"])
    t = dt.datetime.combine(first, dt.time(9, 0)) if args.first is None else parse_time(args.first)
    end, out = parse_time(args.end), []
    while t <= end:
        out.append(t)
        t += dt.timedelta(days=args.every)
    if not out:
        raise InputError(f"--end {args.end} is before the first reading time {t}")
    return out


def rows(prj, args):
    """All rows (time, id, text) of the readings file in time order."""
    start = dt.datetime.combine(prj["project"]["start_date"], dt.time(0, 0))
    fill = parse_fill(args.fill, start)
    steps = increments([(d, h) for d, h, _ in fill])
    cols = build_columns(prj, args, steps)
    rng = random.Random(args.seed) if args.seed is not None else None
    times = reading_times(prj, args)
    args.distress_day = None
    if args.distress_from is not None:
        args.distress_day = (parse_time(args.distress_from) - start).total_seconds() / 86400.0
    out = [(t, FILL_ID, f"{h:.2f}") for _, h, t in fill if t <= times[-1]]
    for time in times:
        day = (time - start).total_seconds() / 86400.0
        for inst in prj["instrument"]:
            if time.date() < inst["baseline_date"]:
                continue
            v = instrument_value(inst, prj, cols, day, args)
            unit, dec = inst["units"], DECIMALS[inst["units"]]
            if rng is not None:
                v += rng.gauss(0.0, PRECISION_SI[inst["kind"]] / TO_SI[unit])
            else:
                dec += 2  # noise-free: two more decimals than a field sheet
            out.append((time, inst["id"], f"{v:.{dec}f}"))
    out.sort(key=lambda r: r[0])
    return out


def write(prj, args, out):
    noise = "noise-free" if args.seed is None else f"Gaussian noise seed {args.seed}"
    cmd = " ".join(["python3", "tests/truth/textbook_readings.py"] + sys.argv[1:])
    if args.distress_from is not None:
        noise += (
            f"; INJECTED from {args.distress_from}: excess pore pressure stops dissipating and rises "
            f"{args.pore_rise_kpa_per_week} kPa/week, toe acceleration {args.lateral_accel_mm_per_day2} mm/day2"
        )
    out.write(
        f"# INVENTED readings from the independent textbook model (not fillpace's engine): rate x{args.rate}, "
        f"compressibility x{args.compressibility}, {noise}, lateral ratio {args.lateral_ratio}.\n"
        f"# Made by: {cmd}\n"
        "# Not measurements. Columns: instrument id, time, value in the instrument's units;\n"
        "# rows `fill` are the as-built crest height above original ground, m. See tests/truth/README.md.\n"
    )
    out.write(HEADER + "\n")
    for time, ident, text in rows(prj, args):
        out.write(f"{ident},{time.strftime('%Y-%m-%dT%H:%M')},{text}\n")


# --------------------------------------------------------------------------
# Self-test against published values and hand calculations


def self_test():
    """Each check: (what, computed, expected, tolerance, source)."""
    checks = [
        ("Terzaghi Uv at Tv = 0.197", terzaghi_average(0.197), 0.50, 0.002,
         "Terzaghi (1943) table of U against Tv: U = 50% at Tv = 0.197"),
        ("Terzaghi Uv at Tv = 0.848", terzaghi_average(0.848), 0.90, 0.002,
         "Terzaghi (1943) table of U against Tv: U = 90% at Tv = 0.848"),
        ("Terzaghi u/u0 at mid-depth, Tv = 0.2: erfc vs Fourier", _erfc_branch(1.0, 0.2), terzaghi_uz(1.0, 0.2), 1e-9,
         "the two exact series of the same solution (image and Fourier) agree"),
        ("Terzaghi u/u0 at the drained face", terzaghi_uz(0.0, 0.3), 0.0, 1e-12, "boundary condition u = 0"),
        ("Hansbo mu, demo drains, no well resistance", hansbo_mu(1.575 / 0.066208, 2.0, 2.0, 0.0, 7.0, 0.0), 3.1124, 5e-4,
         "hand calculation from Hansbo (1981): dw = 2(100+4)/pi = 66.21 mm (Hansbo 1979), de = 1.05 x 1.5 = 1.575 m, "
         "n = 23.79, ln(n/s) = 2.4761, + 2 ln 2 = 1.3863, - 0.75"),
        ("Hansbo well resistance term z = 7, l = 7, kh/qw = 1e-3", hansbo_mu(10.0, 1.0, 1.0, 7.0, 7.0, 1e-3) - (math.log(10) - 0.75),
         math.pi * 49e-3, 1e-12, "Hansbo (1981): pi z (2l - z) kh/qw = pi x 49 x 1e-3 = 0.15394"),
        ("Hansbo Uh at Th = 0.2, mu = 3.1124", hansbo_uh(0.2, 3.1124), 0.40195, 1e-4,
         "closed form 1 - exp(-8 x 0.2 / 3.1124) = 1 - exp(-0.51407) = 0.40195 (hand)"),
        ("Carrillo Uv = 0.5, Uh = 0.6", carrillo(0.5, 0.6), 0.80, 1e-12, "Carrillo (1942): 1 - 0.5 x 0.4"),
        ("Osterberg I, a = b = z", osterberg_factor(1.0, 1.0, 1.0), 0.4548, 2e-4,
         "hand: (1/pi)[2 (atan 2) - pi/4] = (2 x 1.10715 - 0.78540)/pi = 0.45484 (Osterberg 1957 chart ~0.45)"),
        ("strip solution vs Osterberg: centreline, a = b = z", sigma_z(_trapezoid(1.0, 1.0, 100.0), 0.0, 1.0),
         2 * 100.0 * osterberg_factor(1.0, 1.0, 1.0), 1e-9, "Osterberg (1957): centreline = 2 I q"),
        ("strip solution vs Osterberg: a = 10, b = 8, z = 5", sigma_z(_trapezoid(10.0, 8.0, 50.0), 0.0, 5.0),
         2 * 50.0 * osterberg_factor(10.0, 8.0, 5.0), 1e-9, "Osterberg (1957): centreline = 2 I q"),
        ("uniform strip B = 2z, centreline", sigma_z([(-1.0, 1.0), (1.0, 1.0)], 0.0, 1.0), 0.8183, 2e-4,
         "Poulos & Davis (1974) uniform strip: (1/pi)(alpha + sin alpha), alpha = pi/2: 0.81831 (hand)"),
        ("strip solution vs numerical integration of Flamant", sigma_z(_trapezoid(3.0, 2.0, 1.0), 4.0, 2.5),
         _flamant_numeric(_trapezoid(3.0, 2.0, 1.0), 4.0, 2.5), 1e-6, "Flamant line load integrated by Simpson's rule"),
    ] + _model_checks()
    failed = 0
    for what, got, want, tol, src in checks:
        ok = abs(got - want) <= tol
        failed += not ok
        print(f"{'ok  ' if ok else 'FAIL'} {what}: {got:.6f} (expected {want:.6f} +- {tol:g}; {src})")
    print(f"{len(checks) - failed} of {len(checks)} checks pass")
    return 0 if failed == 0 else 1


def _model_checks():
    """Physical bounds of the whole model on a one-sublayer clay under a
    very wide embankment (Δσv = q at its mid-depth)."""
    clay = {"name": "clay", "kind": "clay", "thickness_m": SUBLAYER_M, "unit_weight_kn_m3": 16.0,
            "saturated_unit_weight_kn_m3": 16.0, "e0": 2.0, "cc": 1.0, "cr": 0.1, "pop_kpa": 20.0,
            "cv_m2_per_year": 1.0}
    prj = {"ground": {"groundwater_depth_m": 0.0, "base_drainage": "drained",
                      "layers": [clay, {"name": "sand", "kind": "sand", "thickness_m": 2.0, "unit_weight_kn_m3": 20.0}]},
           "embankment": {"design_height_m": 5.0, "crest_width_m": 2000.0, "side_slope_h_per_v": 2.0,
                          "fill_unit_weight_kn_m3": 20.0}}
    steps = [(0.0, 0.0, 5.0)]

    def column(rate):
        return Column(Stratum(prj, rate, 1.0), 0.0, steps, [0.125])

    c1, c2 = column(1.0), column(2.0)
    return [
        ("model: excess just after loading = Δσv", c1.excess(1e-9, 0.125), 100.0, 1e-3,
         "physical bound: no dissipation at t = 0+ (q = 20 x 5 = 100 kPa)"),
        ("model: excess after 1e6 days", c1.excess(1e6, 0.125), 0.0, 1e-9, "physical bound: full dissipation"),
        ("model: final settlement", c1.settlement(1e6), 0.069060, 2e-6,
         "hand, e-log: s'0 = 0.125 x 6.19 = 0.774, s'p = 20.774, s' = 100.774 kPa; "
         "0.25 [0.1 log(26.848) + 1.0 log(4.8510)] / 3 = 0.06906 m"),
        ("model: rate x2 at 0.1 day = rate x1 at 0.2 day", c2.settlement(0.1), c1.settlement(0.2), 1e-12,
         "time factors scale with cv t"),
    ]


def _erfc_branch(zr, tv):
    s = 2.0 * math.sqrt(tv)
    return 1.0 - sum((-1) ** k * (math.erfc((2 * k + zr) / s) + math.erfc((2 * (k + 1) - zr) / s)) for k in range(30))


def _trapezoid(a, b, q):
    """Symmetric embankment load: half crest b, slope width a, height load q."""
    return [(-(a + b), 0.0), (-b, q), (b, q), (a + b, 0.0)]


def _flamant_numeric(load, x0, z, n=20000):
    def q_at(x):
        for (x1, q1), (x2, q2) in zip(load, load[1:]):
            if x1 <= x <= x2:
                return q1 + (q2 - q1) * (x - x1) / (x2 - x1)
        return 0.0

    xa, xb = load[0][0], load[-1][0]
    h = (xb - xa) / n
    f = [q_at(xa + i * h) * 2 * z**3 / (math.pi * ((xa + i * h - x0) ** 2 + z * z) ** 2) for i in range(n + 1)]
    return h / 3 * (f[0] + f[-1] + 4 * sum(f[1:-1:2]) + 2 * sum(f[2:-1:2]))


# --------------------------------------------------------------------------


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--project", default="examples/kestrel-fen.toml", help="project TOML (default: the demo)")
    ap.add_argument("--rate", type=float, default=1.0, help="multiplier on cv and ch of every clay layer")
    ap.add_argument("--compressibility", type=float, default=1.0, help="multiplier on Cc and Cr of every clay layer")
    noise = ap.add_mutually_exclusive_group()
    noise.add_argument("--seed", type=int, help="add seeded Gaussian noise (precision per instrument kind)")
    noise.add_argument("--noise-free", action="store_true", help="no noise (the default when --seed is absent)")
    ap.add_argument("--lateral-ratio", type=float, default=DEFAULT_LATERAL_RATIO,
                    help="toe marker movement / centreline settlement")
    ap.add_argument("--fill", default=DEMO_FILL, help="as-built record TIME=HEIGHT_M,... (default: the demo's)")
    ap.add_argument("--first", help="first reading time (default: earliest baseline date 09:00)")
    ap.add_argument("--end", default=DEMO_END, help="last reading time, the hold point (default %(default)s)")
    ap.add_argument("--every", type=float, default=3.0, help="days between readings (default 3)")
    ap.add_argument("--distress-from", help="TIME from which to inject the anomaly below (not modelled)")
    ap.add_argument("--pore-rise-kpa-per-week", type=float, default=2.5,
                    help="injected net rise of every piezometer's excess (default %(default)s)")
    ap.add_argument("--lateral-accel-mm-per-day2", type=float, default=0.05,
                    help="injected acceleration of every toe marker (default %(default)s)")
    ap.add_argument("--no-tip-settlement", action="store_true", help="piezometer tips do not settle with the ground")
    ap.add_argument("--out", help="output CSV (default: standard output)")
    ap.add_argument("--self-test", action="store_true", help="run the checks against published values and exit")
    args = ap.parse_args(argv)
    if args.self_test:
        return self_test()
    if args.rate <= 0 or args.compressibility <= 0 or args.every <= 0:
        ap.error("--rate, --compressibility and --every must be positive")
    try:
        with open(args.project, "rb") as f:
            prj = tomllib.load(f)
        if args.out is None:
            write(prj, args, sys.stdout)
        else:
            tmp = args.out + ".tmp"
            with open(tmp, "w", encoding="utf-8") as f:
                write(prj, args, f)
            os.replace(tmp, args.out)
    except (InputError, KeyError, ValueError, OSError, tomllib.TOMLDecodeError) as e:
        print(f"textbook_readings: {args.project}: {e}", file=sys.stderr)
        return 2
    return 0


if __name__ == "__main__":
    sys.exit(main())

//! The cross-section at one moment, in its settled shape: the fill surface is
//! the design profile at the current crest height (its side slopes carried
//! down into the settlement trough), the original ground surface is lowered
//! by the settlement s(x) from the response columns, and a point originally
//! at depth z is taken to have moved down by s(x)(1 − z/D) over the
//! compressible depth D (the base does not move). Weights, materials and
//! strengths of slice bases are looked up through that mapping, so the fill
//! that has sunk below original ground is fill, not clay, and clay strength
//! is sampled at the point's original depth where the columns computed it.

use crate::model::*;
use crate::response::{Across, Cursor, GroundField};
use crate::{ground, load};

/// Far ends of the section's polylines either side of the centreline, m.
const FAR_M: f64 = 1.0e5;

#[derive(Debug, Clone, Copy)]
pub(super) enum Material {
    Clay,
    Sand { c: f64, tan_phi: f64 },
}

#[derive(Debug, Clone)]
pub(super) struct SectionLayer {
    pub name: String,
    /// Original depths of top and bottom below OGL, m.
    pub top_z: f64,
    pub bottom_z: f64,
    pub gamma: f64,
    pub gamma_sat: f64,
    pub material: Material,
    /// Pore pressure in a drained layer.
    pub pore: PoreWater,
    /// Initial piezometric head of the layer (`ground::head_m`; constant in
    /// a sand), elevation above OGL, m.
    pub head_m: f64,
}

/// The section at one moment: fill profile, settled ground, strength field.
#[derive(Debug, Clone)]
pub struct Section<'a> {
    /// Right half of the design fill surface, (x, height above OGL), m.
    pub profile: Vec<(f64, f64)>,
    /// Full settled top surface, left to right.
    pub(super) surface: Vec<(f64, f64)>,
    /// Settled original ground surface, left to right.
    pub(super) ground_line: Vec<(f64, f64)>,
    /// Current elevation of the top of each layer below the surface, as a
    /// polyline on the vertices of `ground_line` (exact: the settlement is
    /// linear between columns and a depth moves by s(x)(1 − z/D)); empty
    /// for the top layer.
    pub(super) layer_tops: Vec<Vec<(f64, f64)>>,
    /// The water table as a polyline (a level line).
    pub(super) water_line: [(f64, f64); 2],
    side_slope: f64,
    pub(super) fill_gamma: f64,
    /// Fill c' and tan φ' after `fill_strength_factor`.
    pub(super) fill_c: f64,
    pub(super) fill_tan_phi: f64,
    /// Pore-pressure ratio in the fill (0: hydrostatic below the water table).
    pub(super) fill_ru: f64,
    /// Fill c' kPa and tan φ' of the fill-face check, and which they are
    /// (`stability.face_strength`).
    pub(super) face_c: f64,
    pub(super) face_tan_phi: f64,
    pub(super) face_strength: FaceStrength,
    /// Rankine tension-crack depth of the fill, 2c'/(γ√Ka) with the reduced
    /// c' and φ' (Ka = tan²(45° − φ'/2)), m; 0 with the crack off.
    pub(super) crack_depth_m: f64,
    /// Share of the crack depth filled with water.
    pub(super) crack_water_fraction: f64,
    pub(super) layers: Vec<SectionLayer>,
    /// Weight of the original soil above each layer's top, and last of
    /// the whole column, kN/m².
    soil_above: Vec<f64>,
    /// Lowest elevation a circle may reach (top of the stiff base), m.
    pub base_y: f64,
    pub(super) water_y: f64,
    pub(super) field: &'a GroundField,
    pub(super) reinforcement_kn: f64,
    pub(super) slices: usize,
}

impl<'a> Section<'a> {
    /// Section with the crest at `height_m` above OGL on the ground state
    /// `field` (strength and settlement).
    pub fn new(project: &Project, height_m: f64, field: &'a GroundField) -> Section<'a> {
        let e = &project.embankment;
        let o = &project.stability;
        let profile = load::profile(e, height_m);
        let mut layers = Vec::new();
        let mut top = 0.0;
        for l in &project.ground.layers {
            let material = match l.kind {
                LayerKind::Clay(_) => Material::Clay,
                LayerKind::Sand { friction_deg, cohesion_kpa } => {
                    Material::Sand { c: cohesion_kpa, tan_phi: friction_deg.to_radians().tan() }
                }
                LayerKind::StiffBase => break,
            };
            layers.push(SectionLayer {
                name: l.name.clone(),
                top_z: top,
                bottom_z: top + l.thickness_m,
                gamma: l.unit_weight_kn_m3,
                gamma_sat: l.saturated_unit_weight_kn_m3,
                material,
                pore: l.pore,
                head_m: ground::head_m(&project.ground, top + 0.5 * l.thickness_m),
            });
            top += l.thickness_m;
        }
        let fill_c = o.fill_strength_factor * e.fill_cohesion_kpa;
        let fill_tan_phi = o.fill_strength_factor * e.fill_friction_deg.to_radians().tan();
        let (face_c, face_tan_phi) = match o.face_strength {
            FaceStrength::Own => (e.fill_cohesion_kpa, e.fill_friction_deg.to_radians().tan()),
            FaceStrength::Factored => (fill_c, fill_tan_phi),
        };
        let mut s = Section {
            surface: Vec::new(),
            ground_line: Vec::new(),
            layer_tops: Vec::new(),
            water_line: [(-FAR_M, -project.ground.groundwater_depth_m), (FAR_M, -project.ground.groundwater_depth_m)],
            profile,
            side_slope: e.side_slope_h_per_v,
            fill_gamma: e.fill_unit_weight_kn_m3,
            fill_c,
            fill_tan_phi,
            fill_ru: o.fill_ru,
            face_c,
            face_tan_phi,
            face_strength: o.face_strength,
            crack_depth_m: if o.fill_tension_crack {
                rankine_crack_depth(fill_c, fill_tan_phi, e.fill_unit_weight_kn_m3)
            } else {
                0.0
            },
            crack_water_fraction: o.crack_water_fraction,
            layers,
            soil_above: Vec::new(),
            base_y: -top,
            water_y: -project.ground.groundwater_depth_m,
            field,
            reinforcement_kn: e.reinforcement_kn_per_m,
            slices: o.slices,
        };
        s.surface = s.build_surface();
        s.ground_line = s.build_ground_line();
        s.soil_above = vec![0.0];
        for l in &s.layers {
            let above = s.soil_above[s.soil_above.len() - 1];
            s.soil_above.push(above + s.layer_weight(l, l.bottom_z));
        }
        s.layer_tops = s
            .layers
            .iter()
            .map(|l| match l.top_z {
                z if z > 0.0 => s.ground_line.iter().map(|&(x, gy)| (x, s.elevation_with(-gy, z))).collect(),
                _ => Vec::new(),
            })
            .collect();
        s
    }

    /// Whether the fill has no strength at all: it is then a load on the
    /// ground (Fellenius 1927's strip load), and every slip surface enters
    /// and leaves through the settled ground.
    pub fn fill_is_load(&self) -> bool {
        self.fill_c <= 0.0 && self.fill_tan_phi <= 0.0
    }

    /// Depth of the fill's tension crack, m (0 where it cannot crack).
    pub fn crack_depth_m(&self) -> f64 {
        self.crack_depth_m
    }

    /// Crest height, m.
    pub fn crest_m(&self) -> f64 {
        self.profile[0].1
    }

    /// Side slope of the fill, horizontal per vertical.
    pub fn side_slope_h_per_v(&self) -> f64 {
        self.side_slope
    }

    /// Toe offset of the design profile on OGL, m.
    pub fn toe_m(&self) -> f64 {
        self.profile.last().map_or(0.0, |p| p.0)
    }

    /// Settled original-ground surface at x (≤ 0), m.
    pub fn ground_y(&self, x: f64) -> f64 {
        -self.field.settlement(x)
    }

    /// Design fill surface at x, with the outer slope carried on below OGL.
    fn fill_top(&self, x: f64) -> f64 {
        let x = x.abs();
        if self.crest_m() <= 0.0 {
            return f64::NEG_INFINITY;
        }
        let toe = self.toe_m();
        if x <= toe { load::height_at(&self.profile, x) } else { -(x - toe) / self.side_slope }
    }

    /// Top of the section at x (fill where there is fill, else ground), m.
    pub fn surface_y(&self, x: f64) -> f64 {
        self.surface_with(x, self.field.settlement(x))
    }

    /// As `surface_y`, given the settlement s at x.
    pub(super) fn surface_with(&self, x: f64, s: f64) -> f64 {
        self.fill_top(x).max(-s)
    }

    /// Full surface polyline: every profile vertex and column offset on both
    /// sides, plus the points where the fill slope meets the settled ground.
    fn build_surface(&self) -> Vec<(f64, f64)> {
        let far = FAR_M;
        let mut xs: Vec<f64> = self.profile.iter().map(|p| p.0).chain(self.field.xs.iter().copied()).collect();
        xs.extend(xs.clone().iter().map(|x| -x));
        xs.extend([-far, far]);
        xs.sort_by(f64::total_cmp);
        xs.dedup_by(|a, b| (*a - *b).abs() < 1e-9);
        let mut pts: Vec<(f64, f64)> = Vec::new();
        for w in xs.windows(2) {
            pts.push((w[0], self.surface_y(w[0])));
            let (d0, d1) = (self.fill_top(w[0]) - self.ground_y(w[0]), self.fill_top(w[1]) - self.ground_y(w[1]));
            if d0.is_finite() && d1.is_finite() && d0 * d1 < 0.0 {
                let x = w[0] + (w[1] - w[0]) * d0 / (d0 - d1);
                pts.push((x, self.surface_y(x)));
            }
        }
        let last = *xs.last().unwrap_or(&far);
        pts.push((last, self.surface_y(last)));
        pts
    }

    /// Settled original ground as a polyline: every column offset on both
    /// sides and far points.
    fn build_ground_line(&self) -> Vec<(f64, f64)> {
        let far = FAR_M;
        let mut xs: Vec<f64> = self.field.xs.iter().flat_map(|x| [*x, -*x]).chain([-far, far]).collect();
        xs.sort_by(f64::total_cmp);
        xs.dedup_by(|a, b| (*a - *b).abs() < 1e-9);
        xs.into_iter().map(|x| (x, self.ground_y(x))).collect()
    }

    /// Original depth below OGL of the soil point now at elevation y where
    /// the surface settlement is s, m.
    pub(super) fn original_depth(&self, s: f64, y: f64) -> f64 {
        let d = -self.base_y;
        (-y - s) / (1.0 - s / d).max(1e-3)
    }

    /// Current elevation of original depth z at offset x, m.
    pub(super) fn elevation_of_depth(&self, x: f64, z: f64) -> f64 {
        self.elevation_with(self.field.settlement(x), z)
    }

    /// Elevation of original depth z where the surface has settled by s, m.
    pub(super) fn elevation_with(&self, s: f64, z: f64) -> f64 {
        -z - s * (1.0 - z / -self.base_y)
    }

    fn layer_at(&self, z: f64) -> Option<&SectionLayer> {
        self.layers.iter().find(|l| z <= l.bottom_z + 1e-9)
    }

    /// Name of the material at (x, y).
    pub(super) fn band_at(&self, x: f64, y: f64) -> String {
        if y >= self.ground_y(x) - 1e-9 {
            return "fill".into();
        }
        self.layer_at(self.original_depth(self.field.settlement(x), y))
            .map_or_else(|| "base".into(), |l| l.name.clone())
    }

    /// Weight of a vertical strip of unit width at x from y_bot to the
    /// surface y_top, kN/m² (soil by its original column, fill below the
    /// water table at its own unit weight), where the surface has settled by
    /// s; `z_bot` is y_bot's original depth (`original_depth(s, y_bot)`,
    /// used only below the ground).
    pub(super) fn column_weight(&self, s: f64, y_bot: f64, y_top: f64, z_bot: f64) -> f64 {
        let gy = -s;
        let w = self.fill_gamma * (y_top - y_bot.max(gy)).max(0.0);
        if y_bot >= gy {
            return w;
        }
        w + self.soil_weight(z_bot)
    }

    /// Weight of the original soil column from OGL to original depth z,
    /// kN/m²: the layers above z's layer whole (`soil_above`), then the part
    /// of its own.
    fn soil_weight(&self, z: f64) -> f64 {
        for (l, above) in self.layers.iter().zip(&self.soil_above) {
            if z <= l.bottom_z {
                return above + self.layer_weight(l, z);
            }
        }
        self.soil_above[self.layers.len()]
    }

    /// Weight of layer l from its top to original depth z (at most its
    /// bottom), saturated below the water table, kN/m².
    fn layer_weight(&self, l: &SectionLayer, z: f64) -> f64 {
        let (lo, hi) = (l.top_z, l.bottom_z.min(z));
        if hi <= lo {
            return 0.0;
        }
        let wet = (hi - lo.max(-self.water_y)).max(0.0);
        l.gamma_sat * wet + l.gamma * (hi - lo - wet)
    }

    /// (c kPa, tan φ, u kPa) at a slice base at height y, settlement s there,
    /// under a total vertical stress `sigma_v` kPa (for ru): the fill's or
    /// a sand layer's drained strength and pore pressure (from the sand's
    /// initial head, fixed in space while the point settles), or the clay's
    /// su on its own side of a layer boundary (undrained: u not used here;
    /// the clay's initial pore pressure enters through σ'v0 and σ'p0 of the
    /// ground nodes, from the same `ground::head_m`). The clay's su is
    /// looked up at `at` (the slice's offset among the columns) from `cur`
    /// (the circle's cursor in the field).
    /// z is y's original depth (`original_depth(s, y)`, used only below the
    /// ground).
    pub(super) fn strength_at(
        &self,
        at: Across,
        s: f64,
        y: f64,
        z: f64,
        sigma_v: f64,
        cur: &mut Cursor,
    ) -> (f64, f64, f64) {
        let hydrostatic = |level: f64| GAMMA_W * (level - y).max(0.0);
        if y >= -s - 1e-9 {
            let u = if self.fill_ru > 0.0 { self.fill_ru * sigma_v } else { hydrostatic(self.water_y) };
            return (self.fill_c, self.fill_tan_phi, u);
        }
        match self.layer_at(z) {
            Some(SectionLayer { material: Material::Sand { c, tan_phi }, pore, head_m, .. }) => {
                let u = match *pore {
                    PoreWater::Hydrostatic | PoreWater::Level { .. } => hydrostatic(*head_m),
                    PoreWater::Ratio { ru } => ru * sigma_v,
                };
                (*c, *tan_phi, u)
            }
            _ => (self.field.sample_across(at, z, cur), 0.0, 0.0),
        }
    }

    /// Moment of the basal reinforcement about the centre of circle: its
    /// design force acts horizontally at the fill base where the circle cuts
    /// it under the fill (lever arm yc − y), kN·m per m.
    pub(super) fn reinforcement_moment(&self, xc: f64, yc: f64, r: f64, entry: f64, exit: f64) -> f64 {
        if self.reinforcement_kn <= 0.0 {
            return 0.0;
        }
        let toe = self.toe_m();
        let mut best = 0.0f64;
        for side in [-1.0, 1.0] {
            // Fixed point: the base elevation depends on where it is cut.
            let mut y = self.ground_y(xc);
            let mut x = xc;
            for _ in 0..3 {
                let d = r * r - (yc - y).powi(2);
                if d <= 0.0 {
                    break;
                }
                x = xc + side * d.sqrt();
                y = self.ground_y(x);
            }
            if x >= entry && x <= exit && x.abs() < toe && yc > y {
                best = best.max(self.reinforcement_kn * (yc - y));
            }
        }
        best
    }
}

/// Rankine tension-crack depth 2c'/(γ√Ka), Ka = tan²(45° − φ'/2), m.
pub fn rankine_crack_depth(c: f64, tan_phi: f64, gamma: f64) -> f64 {
    let ka = (std::f64::consts::FRAC_PI_4 - 0.5 * tan_phi.atan()).tan().powi(2);
    2.0 * c / (gamma * ka.sqrt())
}

//! A fill without strength (`fill_strength_factor = 0`) is taken as a
//! vertical load on the ground with no lateral thrust. On a circle through
//! the fill that idealisation can give a higher FS than the fill's own
//! strength does (a practising engineer's review found 1.56 against 1.31 on
//! the demo), so wherever it is used the same section is also evaluated
//! with the fill at the strength the file gives it, and the lower FS is
//! kept (the face check is the file's: at the fill's own strength by
//! default, none with `face_strength = "factored"`). Conservative by
//! construction: the answer never exceeds either idealisation.

use super::search::{FACE_MECHANISM, SearchResult, search};
use super::{Circle, CircleResult, Reject, Section};
use crate::error::Result;
use crate::model::Project;
use crate::response::GroundField;

/// The project with the fill at its own strength, when the file takes it
/// as a load (None otherwise).
fn with_fill_strength(p: &Project) -> Option<Project> {
    applies(p).then(|| {
        let mut strong = p.clone();
        strong.stability.fill_strength_factor = 1.0;
        strong
    })
}

/// Whether the file takes the fill as a load (and so every FS needs the
/// second evaluation).
pub fn applies(p: &Project) -> bool {
    p.stability.fill_strength_factor <= 0.0
}

/// `found` (a search on the section of `p` at `height_m`), or the search
/// with the fill at its own strength where that circle is lower.
pub fn lower_search(p: &Project, height_m: f64, field: &GroundField, found: SearchResult) -> Result<SearchResult> {
    let Some(strong) = with_fill_strength(p) else { return Ok(found) };
    let other = search(&Section::new(&strong, height_m, field))?;
    if other.critical.fs >= found.governing_fs() {
        return Ok(found);
    }
    let mut r = other;
    // The face check is that of the file's own settings (`found`).
    r.face = found.face;
    (r.fs_governing, r.mechanism) = match r.face {
        Some(f) if f.fs < r.critical.fs => (f.fs, FACE_MECHANISM.to_string()),
        _ => (r.critical.fs, format!("{} (circle through the fill at its own strength)", r.critical.band)),
    };
    Ok(r)
}

/// One circle on the section of `p` at `height_m`, the lower of the two
/// idealisations where the fill is taken as a load.
pub fn lower_circle(
    p: &Project,
    height_m: f64,
    field: &GroundField,
    c: Circle,
) -> std::result::Result<CircleResult, Reject> {
    let r = Section::new(p, height_m, field).analyse(c);
    let Some(strong) = with_fill_strength(p) else { return r };
    let other = Section::new(&strong, height_m, field).analyse(c);
    match (r, other) {
        (Ok(a), Ok(b)) => Ok(if b.fs < a.fs { b } else { a }),
        (Ok(a), Err(_)) => Ok(a),
        (Err(_), Ok(b)) => Ok(b),
        (Err(e), Err(_)) => Err(e),
    }
}

//! From a stored series to a proposed change of the matching catalogue
//! friction entry: the new ranges (observed, or mean ± 3σ), the diff against
//! the entry, and how the specs of a few representative joints would move
//! (M8, M10 and M12, class 8.8, hexagon head, no washer, medium hole,
//! click wrench), computed by the engine with the current and the proposed
//! friction.

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use super::units;
use crate::app::quantity::{Quantity, Units};
use crate::app::{AppError, FieldProblem};
use crate::catalogue::{EntryInput, FrictionEntry, RangeInput, Snapshot};
use crate::engine::bearing::{bearing_surface, HeadType, HoleSeries, Washer};
use crate::engine::calibration::proposal::{propose, ProposedRange};
use crate::engine::calibration::SeriesStatistics;
use crate::engine::method::TighteningMethod;
use crate::engine::quantity::FrictionRange;
use crate::engine::spec::{self, SpecFlags, SpecInput, WindowMode};
use crate::engine::{grade, thread, EngineError};

pub use crate::engine::calibration::proposal::Basis;

/// Representative joints whose specs the proposal is shown on.
pub const REPRESENTATIVE_THREADS: [&str; 3] = ["M8", "M10", "M12"];
const REPRESENTATIVE_CLASS: &str = "8.8";
const REPRESENTATIVE_METHOD: TighteningMethod = TighteningMethod::ClickWrench;

/// A friction range on the wire.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct RangeResponse {
    pub min: f64,
    pub max: f64,
}

/// One coefficient of the entry: now and as proposed.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct RangeChange {
    /// `thread_friction`, `bearing_friction` or `total_friction`.
    pub coefficient: String,
    pub current: Option<RangeResponse>,
    pub proposed: Option<RangeResponse>,
    pub changed: bool,
    /// Why the proposed value is what it is (taken from the series, kept
    /// because the series does not give it, or clamped to plausible values).
    pub note: String,
}

/// Spec figures of one joint.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct SpecFigures {
    pub torque_lower: Quantity,
    pub torque_target: Quantity,
    pub torque_upper: Quantity,
    pub preload_min: Quantity,
    pub preload_max: Quantity,
}

/// How one representative spec moves.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct SpecEffect {
    pub thread: String,
    pub property_class: String,
    pub head: String,
    pub hole: String,
    pub tightening_method: String,
    pub current: SpecFigures,
    pub proposed: SpecFigures,
    /// Relative change of the target torque, e.g. -0.08 for −8 %.
    pub torque_target_change: f64,
    pub preload_min_change: f64,
    pub preload_max_change: f64,
}

/// The proposed catalogue change.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct ProposalResponse {
    pub series_id: i64,
    /// `observed` or `three_sigma`.
    pub basis: String,
    pub catalogue_revision: i64,
    pub entry_id: i64,
    /// Send this as `If-Match` when applying.
    pub entry_etag: String,
    pub finish: String,
    pub lubricant: String,
    pub changes: Vec<RangeChange>,
    /// The `source` the entry would carry after the change.
    pub proposed_source: String,
    /// The `notes` the entry would carry after the change: the earlier
    /// notes described the earlier values (they stay in the history).
    pub proposed_notes: String,
    pub effect: Vec<SpecEffect>,
    pub cautions: Vec<String>,
}

/// A proposal and the entry input that applying it submits.
pub struct Proposed {
    pub response: ProposalResponse,
    pub entry: EntryInput,
}

/// Notes for an entry changed by a series: which ranges it measured and
/// which were kept, never the earlier notes about where values came from.
fn proposed_notes(series_id: i64, changes: &[&RangeChange]) -> String {
    let names = |changed: bool| {
        changes
            .iter()
            .filter(|c| c.changed == changed && (changed || c.current.is_some()))
            .map(|c| c.coefficient.replace('_', " "))
            .collect::<Vec<_>>()
    };
    let (measured, kept) = (names(true), names(false));
    let mut notes = format!("Changed by friction test series {series_id}");
    if !measured.is_empty() {
        notes.push_str(&format!(": {} from the series", measured.join(", ")));
    }
    if !kept.is_empty() {
        notes.push_str(&format!(
            "; {} kept from the earlier entry",
            kept.join(", ")
        ));
    }
    notes.push_str(". The earlier source and notes are in the entry's history.");
    notes
}

fn wire(r: Option<(f64, f64)>) -> Option<RangeResponse> {
    r.map(|(min, max)| RangeResponse { min, max })
}

fn change(
    name: &str,
    current: Option<(f64, f64)>,
    proposed: Option<ProposedRange>,
    series_id: i64,
) -> (RangeChange, Option<(f64, f64)>) {
    let (after, note) = match proposed {
        Some(p) if p.clamped => (
            Some((p.min, p.max)),
            format!(
                "from series {series_id}, clamped to the plausible 0.02–0.6 and rounded outward \
                 to 0.001"
            ),
        ),
        Some(p) => (
            Some((p.min, p.max)),
            format!("from series {series_id}, rounded outward to 0.001"),
        ),
        None => (
            current,
            "kept: the series' record form does not give this coefficient".to_owned(),
        ),
    };
    let changed = after != current;
    (
        RangeChange {
            coefficient: name.into(),
            current: wire(current),
            proposed: wire(after),
            changed,
            note,
        },
        after,
    )
}

/// The basis a proposal or an apply names (field `basis`): missing is
/// invalid, an unknown name is unknown with the two known ones suggested.
pub fn basis(b: Option<&str>) -> Result<Basis, FieldProblem> {
    match b {
        None => Err(FieldProblem::invalid(
            "basis",
            "missing: choose observed (min to max of the series) or three_sigma (mean ± 3σ)",
        )),
        Some(b) => Ok(Basis::parse(b)?),
    }
}

/// Builds the proposal for `series_id` against the current snapshot.
#[allow(clippy::too_many_arguments)]
pub fn build(
    snap: &Snapshot,
    series_id: i64,
    finish: &str,
    lubricant: &str,
    stats: &SeriesStatistics,
    count: usize,
    basis: Basis,
    u: Units,
) -> Result<Proposed, AppError> {
    let entry = snap.friction_for(finish, lubricant)?.clone();
    Ok(build_for(snap, &entry, series_id, stats, count, basis, u)?)
}

fn build_for(
    snap: &Snapshot,
    entry: &FrictionEntry,
    series_id: i64,
    stats: &SeriesStatistics,
    count: usize,
    basis: Basis,
    u: Units,
) -> Result<Proposed, EngineError> {
    let p = propose(stats, basis)?;
    let pair = |r: &crate::catalogue::TabulatedFriction| (r.min, r.max);
    let (thread_c, thread_after) = change(
        "thread_friction",
        Some(pair(&entry.thread_friction)),
        p.thread_friction,
        series_id,
    );
    let (bearing_c, bearing_after) = change(
        "bearing_friction",
        Some(pair(&entry.bearing_friction)),
        p.bearing_friction,
        series_id,
    );
    let (total_c, total_after) = change(
        "total_friction",
        entry.total_friction.as_ref().map(pair),
        p.total_friction,
        series_id,
    );
    let source = format!(
        "friction test series {series_id} ({count} specimens, {} basis; ISO 16047 evaluation)",
        match basis {
            Basis::Observed => "observed range",
            Basis::ThreeSigma => "mean ± 3σ",
        }
    );
    let mut input = EntryInput::from(entry);
    let range = |(min, max): (f64, f64)| RangeInput { min, max };
    if let Some(r) = thread_after {
        input.thread_friction = range(r);
    }
    if let Some(r) = bearing_after {
        input.bearing_friction = range(r);
    }
    input.total_friction = total_after.map(range);
    input.source = source.clone();
    let notes = proposed_notes(series_id, &[&thread_c, &bearing_c, &total_c]);
    input.notes = notes.clone();

    let flags = flags(snap, entry);
    let current = (pair(&entry.thread_friction), pair(&entry.bearing_friction));
    let proposed = (
        thread_after.unwrap_or(current.0),
        bearing_after.unwrap_or(current.1),
    );
    let effect = REPRESENTATIVE_THREADS
        .iter()
        .map(|t| effect(t, current, proposed, &flags, u))
        .collect::<Result<Vec<_>, _>>()?;
    Ok(Proposed {
        response: ProposalResponse {
            series_id,
            basis: basis.as_str().into(),
            catalogue_revision: snap.revision,
            entry_id: entry.id,
            entry_etag: entry.etag(),
            finish: entry.finish.clone(),
            lubricant: entry.lubricant.clone(),
            changes: vec![thread_c, bearing_c, total_c],
            proposed_source: source,
            proposed_notes: notes,
            effect,
            cautions: crate::engine::cautions::CautionSet::base()
                .texts()
                .map(str::to_owned)
                .collect(),
        },
        entry: input,
    })
}

fn flags(snap: &Snapshot, entry: &FrictionEntry) -> SpecFlags {
    let finish = snap.finish(&entry.finish).ok();
    SpecFlags {
        electroplated: finish.is_some_and(|f| f.electroplated),
        hot_dip_galvanized: finish.is_some_and(|f| f.hot_dip_galvanized()),
        acid_cleaned: finish.is_some_and(|f| f.acid_cleaned()),
        dry: snap
            .lubricant(&entry.lubricant)
            .map(|l| l.dry)
            .unwrap_or(false),
        ..SpecFlags::default()
    }
}

type Pair = (f64, f64);

fn figures(
    designation: &str,
    (th, b): (Pair, Pair),
    flags: &SpecFlags,
    u: Units,
) -> Result<SpecFigures, EngineError> {
    let thread = thread::parse_designation(designation)?;
    let strength = grade::strength_for(REPRESENTATIVE_CLASS, &thread)?;
    let bearing = bearing_surface(
        &thread,
        HeadType::HexagonHead,
        Washer::None,
        HoleSeries::Medium,
    )?;
    let input = SpecInput {
        thread,
        strength,
        bearing,
        thread_friction: FrictionRange::new(th.0, th.1, "thread_friction")?,
        bearing_friction: FrictionRange::new(b.0, b.1, "bearing_friction")?,
        friction_source: "friction test proposal".into(),
        method: REPRESENTATIVE_METHOD,
        scatter: None,
        utilisation: None,
        prevailing_torque: None,
        clamped_material: None,
        joint: None,
        tapped_hole: None,
        parts: Default::default(),
        required_clamp_load: None,
        window_mode: WindowMode::MaximumPreload,
        flags: *flags,
        joint_model: Default::default(),
    };
    let w = spec::compute(&input)?.window;
    Ok(SpecFigures {
        torque_lower: units::torque(w.lower, u),
        torque_target: units::torque(w.target, u),
        torque_upper: units::torque(w.upper, u),
        preload_min: Quantity::force(w.preload_min, u),
        preload_max: Quantity::force(w.preload_max, u),
    })
}

fn effect(
    designation: &str,
    current: (Pair, Pair),
    proposed: (Pair, Pair),
    flags: &SpecFlags,
    u: Units,
) -> Result<SpecEffect, EngineError> {
    let before = figures(designation, current, flags, u)?;
    let after = figures(designation, proposed, flags, u)?;
    let rel = |a: &Quantity, b: &Quantity| {
        if a.value == 0.0 {
            0.0
        } else {
            b.value / a.value - 1.0
        }
    };
    Ok(SpecEffect {
        thread: designation.into(),
        property_class: REPRESENTATIVE_CLASS.into(),
        head: HeadType::HexagonHead.id().into(),
        hole: HoleSeries::Medium.id().into(),
        tightening_method: REPRESENTATIVE_METHOD.id().into(),
        torque_target_change: rel(&before.torque_target, &after.torque_target),
        preload_min_change: rel(&before.preload_min, &after.preload_min),
        preload_max_change: rel(&before.preload_max, &after.preload_max),
        current: before,
        proposed: after,
    })
}

#[cfg(test)]
mod tests;

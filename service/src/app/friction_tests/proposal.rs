//! From a stored series to a proposed change of the matching catalogue
//! friction entry: the new ranges (observed, or mean ± 3σ), the diff against
//! the entry, and the entry body that applying it submits. The proposal's
//! impact on the registered joints is computed by `App::impact_of` (see
//! `series.rs`), the same computation `POST /v1/catalogue/impact` runs.

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use crate::app::impact::ImpactResponse;
use crate::app::{AppError, FieldProblem};
use crate::catalogue::{EntryInput, FrictionEntry, RangeInput, Snapshot};
use crate::engine::calibration::proposal::{propose, ProposedRange};
use crate::engine::calibration::SeriesStatistics;
use crate::engine::EngineError;

pub use crate::engine::calibration::proposal::Basis;

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

/// The proposed catalogue change.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
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
    /// The change's impact on every joint with an active release: the
    /// stored release (before) against the joint computed with the
    /// proposed entry (after), as `POST /v1/catalogue/impact` answers for
    /// `{"friction_test": series_id, "basis": basis}`.
    pub impact: ImpactResponse,
    pub cautions: Vec<String>,
}

/// A proposal before its impact is known, and the entry input that
/// applying it submits.
pub struct Proposed {
    pub series_id: i64,
    pub basis: Basis,
    pub catalogue_revision: i64,
    /// The entry as it is now.
    pub current: FrictionEntry,
    pub changes: Vec<RangeChange>,
    pub entry: EntryInput,
}

impl Proposed {
    /// The catalogue friction entry the proposal changes.
    pub fn entry_id(&self) -> i64 {
        self.current.id
    }

    /// The answer, with the impact computed for this proposal.
    pub fn response(&self, impact: ImpactResponse) -> ProposalResponse {
        ProposalResponse {
            series_id: self.series_id,
            basis: self.basis.as_str().into(),
            catalogue_revision: self.catalogue_revision,
            entry_id: self.current.id,
            entry_etag: self.current.etag(),
            finish: self.current.finish.clone(),
            lubricant: self.current.lubricant.clone(),
            changes: self.changes.clone(),
            proposed_source: self.entry.source.clone(),
            proposed_notes: self.entry.notes.clone(),
            impact,
            cautions: crate::engine::cautions::CautionSet::base()
                .texts()
                .map(str::to_owned)
                .collect(),
        }
    }
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
) -> Result<Proposed, AppError> {
    let entry = snap.friction_for(finish, lubricant)?.clone();
    Ok(build_for(snap, entry, series_id, stats, count, basis)?)
}

fn build_for(
    snap: &Snapshot,
    entry: FrictionEntry,
    series_id: i64,
    stats: &SeriesStatistics,
    count: usize,
    basis: Basis,
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
    let mut input = EntryInput::from(&entry);
    let range = |(min, max): (f64, f64)| RangeInput { min, max };
    if let Some(r) = thread_after {
        input.thread_friction = range(r);
    }
    if let Some(r) = bearing_after {
        input.bearing_friction = range(r);
    }
    input.total_friction = total_after.map(range);
    input.source = source;
    input.notes = proposed_notes(series_id, &[&thread_c, &bearing_c, &total_c]);
    Ok(Proposed {
        series_id,
        basis,
        catalogue_revision: snap.revision,
        current: entry,
        changes: vec![thread_c, bearing_c, total_c],
        entry: input,
    })
}

#[cfg(test)]
mod tests;

//! The chart use cases: the same input as a JSON answer in, an SVG picture
//! of it out (`chart::render` writes the document; the builders here decide
//! what is drawn, from the answer the JSON route gives).
//!
//! - [`window`] — the tightening window: clamp force against torque at
//!   minimum, nominal and maximum friction, the torque window, preload
//!   limits, F_M,zul, the yield-limited torque, the required clamp load.
//! - [`angle`] — clamp force against angle from snug, the angle window and
//!   the angle at yield.
//! - [`friction_test`] — a stored friction test series: each specimen's
//!   torque against clamp force and the spread of μ_th, μ_b (and μ_tot)
//!   with mean ± 3σ.
//! - [`history`] — a catalogue friction entry's ranges over its revisions.
//! - [`joint_diagram`] — the joint's force–deformation diagram in the
//!   working state (F_M, F_Z, F_A, F_SA, F_KR,min).
//! - [`released`] — the tightening window of a joint's release, redrawn
//!   from the joint's request at the release's catalogue revision.

pub mod angle;
pub mod friction_test;
pub mod history;
pub mod joint_diagram;
pub mod released;
pub mod window;

use uom::si::f64::{Force, Torque};

use crate::app::quantity::{Quantity, Units};
use crate::app::spec::{compute_one, Resolved, SpecRequest};
use crate::app::AppError;
use crate::catalogue::Snapshot;
use crate::chart;

/// One chart as served: the SVG text and what its ETag is made of.
#[derive(Debug, Clone, PartialEq)]
pub struct SpecChart {
    pub svg: String,
    /// The spec's content hash (normalised request and catalogue revision).
    pub content_hash: String,
    pub units: Units,
    /// True when the request named a catalogue revision.
    pub pinned: bool,
}

/// The caution every chart of a spec carries (the same rule as the spec's
/// cautions, in one line).
pub const SPEC_CAUTION: &str = "Engineering estimates: confirm by joint tests (ISO 16047) and \
    tool capability; drawings, local codes and licensed engineering practice take precedence; \
    safety-critical joints need the responsible engineer's sign-off.";

/// The unit system of a chart: forces in kN (SI) or lbf (US), torques in
/// N·m or lbf·ft, as the spec's JSON answer gives them (forces there in N).
#[derive(Debug, Clone, Copy)]
pub struct Scale(pub Units);

impl Scale {
    pub fn force(self, f: Force) -> f64 {
        let q = Quantity::force(f, self.0);
        match self.0 {
            Units::Si => q.value / 1000.0,
            Units::Us => q.value,
        }
    }
    pub fn force_unit(self) -> &'static str {
        match self.0 {
            Units::Si => "kN",
            Units::Us => "lbf",
        }
    }
    pub fn torque(self, t: Torque) -> f64 {
        Quantity::torque(t, self.0).value
    }
    pub fn torque_unit(self) -> String {
        Quantity::torque(Torque::default(), self.0)
            .unit
            .into_owned()
    }
    /// A force with its unit, for labels (`24.3 kN`, `5460 lbf`).
    pub fn force_text(self, f: Force) -> String {
        match self.0 {
            Units::Si => format!("{:.1} kN", self.force(f)),
            Units::Us => format!("{:.0} lbf", self.force(f)),
        }
    }
    /// A torque with its unit, for labels (`41.2 N·m`).
    pub fn torque_text(self, t: Torque) -> String {
        format!("{:.1} {}", self.torque(t), self.torque_unit())
    }
}

/// The tightening-window chart of a spec request.
pub fn spec_window_chart(req: &SpecRequest, snapshot: &Snapshot) -> Result<SpecChart, AppError> {
    let (resolved, spec) = compute_one(req, snapshot)?;
    let figure = window::figure(&spec, &resolved);
    Ok(served(figure, resolved))
}

/// The torque–angle chart of a spec request; a spec without an angle
/// window is refused naming what it lacks.
pub fn spec_angle_chart(req: &SpecRequest, snapshot: &Snapshot) -> Result<SpecChart, AppError> {
    let (resolved, spec) = compute_one(req, snapshot)?;
    let figure = angle::figure(&spec, &resolved)?;
    Ok(served(figure, resolved))
}

/// The joint diagram (working state) of a spec request; a spec without a
/// joint model under an axial load is refused naming what it lacks.
pub fn spec_joint_diagram(req: &SpecRequest, snapshot: &Snapshot) -> Result<SpecChart, AppError> {
    let (resolved, spec) = compute_one(req, snapshot)?;
    let figure = joint_diagram::figure(&spec, &resolved)?;
    Ok(served(figure, resolved))
}

fn served(figure: chart::Figure, resolved: Resolved) -> SpecChart {
    SpecChart {
        svg: chart::render(&figure),
        content_hash: resolved.content_hash,
        units: resolved.units,
        pinned: resolved.pinned,
    }
}

//! The answers of the spec use cases as the API serves them and
//! `tightspec spec --json` prints them (the CLI's JSON is the API's JSON, so
//! the views live here where both adapters reach them). This file builds the
//! tightening-spec answer; `parts` holds its pieces, `checks` the checks
//! and `setpoints` the tool's answer.
//!
//! Wire response of a tightening spec. Every physical quantity is a
//! `{"value", "unit"}` object in the requested unit system (SI: N, N·m, mm,
//! mm², MPa, degrees; US: lbf, lbf·ft, in, in², ksi, degrees). Built from the
//! engine's `Spec` explicitly (engine types hold uom quantities and are not
//! serialised themselves).

use serde::Serialize;
use utoipa::ToSchema;

use crate::engine::angle::{AngleOutcome, SnugSource};
use crate::engine::spec::{FrictionFigures, Spec, ValueSource, WindowMode};
use crate::engine::window::Governing;

use super::cautions::Cautions;
use super::friction::FrictionOrigin;
use super::resolve::Resolved;
use crate::app::quantity::Quantity;
use crate::app::quantity::Units;

mod assumptions;
mod checks;
mod joint;
mod parts;
mod setpoints;
pub use checks::{checks_out, error_count, CheckOut};
pub use joint::{joint_out, EmbeddingOut, JointOut, SafetyOut};
pub use parts::*;
pub use setpoints::{SetpointAngle, SetpointResponse};

/// A complete tightening specification.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct SpecResponse {
    pub torque: TorqueOut,
    pub preload: PreloadOut,
    pub angle: AngleOut,
    /// α_A = preload max / preload min of this window.
    pub tightening_factor: f64,
    /// `maximum-preload` or `minimum-clamp-load`.
    pub window_mode: &'static str,
    /// What limits the upper torque: `minimum_friction`,
    /// `maximum_thread_friction` or `required_clamp_load`.
    pub governing: &'static str,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub clamp_load: Option<ClampLoadOut>,
    pub method: MethodOut,
    /// Utilisation ν of the minimum yield strength.
    pub utilisation: f64,
    /// `given` or `default` (0.9, VDI 2230 Part 1).
    pub utilisation_source: &'static str,
    pub prevailing_torque: Quantity,
    pub fastener: FastenerOut,
    pub friction: FrictionOut,
    /// Torque split, nut factor and total friction at both friction corners.
    pub figures: FiguresPair,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub clamped_material: Option<String>,
    /// The joint model (VDI 2230 Part 1): resiliences, load factor,
    /// embedding and, with `loads`, the working state; absent where the
    /// joint (clamp length or stack, material, outer diameter) is not given.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub joint: Option<JointOut>,
    pub checks: Vec<CheckOut>,
    #[schema(value_type = Vec<String>)]
    pub cautions: Cautions,
    pub assumptions: Vec<String>,
    pub catalogue_revision: i64,
    /// True when the database is unreachable and the catalogue may be stale.
    pub catalogue_may_be_stale: bool,
    /// `si` or `us`.
    pub units: Units,
    /// SHA-256 (hex) of every input that changes this answer: the
    /// normalised request, the catalogue revision, the unit system, the
    /// engine method version and the service version.
    pub spec_hash: String,
    /// The service's version that computed this answer.
    pub service_version: &'static str,
    /// The engine method version that computed this answer (raised when a
    /// change to the engine can change an answer).
    pub method_version: &'static str,
}

/// The response's unit system applied to `app::quantity` conversions.
#[derive(Clone, Copy)]
struct Out(Units);

impl Out {
    fn force(self, v: uom::si::f64::Force) -> Quantity {
        Quantity::force(v, self.0)
    }
    fn torque(self, v: uom::si::f64::Torque) -> Quantity {
        Quantity::torque(v, self.0)
    }
    fn length(self, v: uom::si::f64::Length) -> Quantity {
        Quantity::length(v, self.0)
    }
    fn area(self, v: uom::si::f64::Area) -> Quantity {
        Quantity::area(v, self.0)
    }
    fn stress(self, v: uom::si::f64::Pressure) -> Quantity {
        Quantity::stress(v, self.0)
    }
    fn angle(self, v: uom::si::f64::Angle) -> Quantity {
        Quantity::angle(v)
    }
}

fn source(v: ValueSource) -> &'static str {
    match v {
        ValueSource::Given => "given",
        ValueSource::Default => "default",
    }
}

fn side(min: f64, max: f64, origin: &FrictionOrigin) -> FrictionSideOut {
    FrictionSideOut {
        min,
        max,
        origin: match origin {
            FrictionOrigin::Request => "request",
            FrictionOrigin::Catalogue { .. } => "catalogue",
        },
    }
}

fn entry_ref(origin: &FrictionOrigin) -> Option<CatalogueEntryRef> {
    match origin {
        FrictionOrigin::Request => None,
        FrictionOrigin::Catalogue {
            entry_id,
            entry_revision,
            reference,
        } => Some(CatalogueEntryRef {
            id: *entry_id,
            revision: *entry_revision,
            source: reference.clone(),
        }),
    }
}

fn figures(o: Out, f: &FrictionFigures) -> FiguresOut {
    FiguresOut {
        thread_friction: f.thread_friction,
        bearing_friction: f.bearing_friction,
        preload_at_target: o.force(f.preload_at_target),
        torque_split: TorqueSplitOut {
            pitch: f.split.pitch,
            thread_friction: f.split.thread_friction,
            bearing_friction: f.split.bearing_friction,
            prevailing: f.split.prevailing,
        },
        nut_factor: f.nut_factor,
        total_friction: f.total_friction,
    }
}

fn thread_form(spec: &Spec) -> &'static str {
    match spec.thread.form {
        crate::engine::thread::ThreadForm::IsoMetric => "iso_metric",
        crate::engine::thread::ThreadForm::Unified => "unified",
    }
}

fn thread_series(spec: &Spec) -> &'static str {
    use crate::engine::thread::ThreadSeries as S;
    match spec.thread.series {
        S::Coarse => "coarse",
        S::Fine => "fine",
        S::Unc => "unc",
        S::Unf => "unf",
        S::Un8 => "8-un",
        S::Custom => "custom",
    }
}

fn yield_basis(spec: &Spec) -> &'static str {
    use crate::engine::grade::YieldBasis as Y;
    match spec.strength.yield_basis {
        Y::LowerYield => "lower_yield",
        Y::ProofStrength02 => "proof_strength02",
        Y::FullSizeRpf => "full_size_rpf",
        Y::InchYield => "inch_yield",
    }
}

/// The response for a computed spec.
pub fn spec_response(spec: &Spec, resolved: &Resolved, stale: bool) -> SpecResponse {
    let o = Out(resolved.units);
    let w = &spec.window;
    let angle = match &spec.angle {
        AngleOutcome::Computed(a) => AngleOut {
            computed: true,
            min: Some(o.angle(a.angle_min)),
            max: Some(o.angle(a.angle_max)),
            at_yield: Some(o.angle(a.angle_at_yield)),
            snug_torque: Some(o.torque(a.snug_torque)),
            snug_torque_source: Some(match a.snug_source {
                SnugSource::Given => "given",
                SnugSource::DefaultFraction => "default",
            }),
            reason: None,
        },
        AngleOutcome::NotComputed { reason } => AngleOut {
            computed: false,
            min: None,
            max: None,
            at_yield: None,
            snug_torque: None,
            snug_torque_source: None,
            reason: Some(reason.clone()),
        },
    };
    let t = &spec.thread;
    let stress_area = o.area(t.stress_area);
    let m = spec.method;
    let f = &resolved.friction;
    let mut assumptions = vec![
        spec.torque_formula.description().to_string(),
        format!(
            "F_M,zul from the combined tension and torsion stress at ν = {} of the minimum \
             yield strength ({}), VDI 2230 Part 1",
            spec.utilisation, spec.strength.standard
        ),
        format!("bearing surface: {}", spec.bearing.source),
        format!("friction: {}", spec.friction_source),
    ];
    if matches!(spec.angle, AngleOutcome::Computed(_)) {
        assumptions.push(if resolved.input.flags.bolt_described {
            "bolt: the shank sections inside the clamp length and the free loaded thread \
             behind them are in the bolt's resilience (VDI 2230 Part 1 §5.1.1)"
                .to_string()
        } else {
            "bolt: taken as threaded up to the head (no bolt described), so the bolt's \
             resilience has no shank; a plain shank inside the clamp length makes the bolt \
             stiffer and the angle window smaller"
                .to_string()
        });
    }
    if spec.joint_model.is_some() {
        assumptions.push(
            "joint: δ_S and δ_P by the VDI 2230 Part 1 substitute body (cone or sleeve by the \
             outer diameter, each clamped layer with its own modulus); embedding f_Z from \
             VDI 2230 Part 1 Table 5 by roughness class, and its preload loss F_Z is taken \
             off the clamp load (values recalled from memory; confirm by joint tests)"
                .to_string(),
        );
    }
    assumptions.extend(assumptions::partner_assumptions(&resolved.input));
    if spec.scatter_source == ValueSource::Default {
        assumptions.push(format!(
            "tool scatter ±{:.0} % from the method default: {}",
            spec.scatter * 100.0,
            m.scatter_source
        ));
    }
    assumptions::controlled_assumptions(spec, &mut assumptions);
    SpecResponse {
        torque: TorqueOut {
            role: if m.torque_controlled {
                "setting"
            } else {
                "monitoring"
            },
            lower: o.torque(w.lower),
            target: o.torque(w.target),
            upper: o.torque(w.upper),
            upper_limit: o.torque(w.upper_limit),
        },
        preload: PreloadOut {
            min: o.force(w.preload_min),
            max: o.force(w.preload_max),
            permissible: o.force(w.permissible_preload),
        },
        angle,
        tightening_factor: w.tightening_factor,
        window_mode: match spec.window_mode {
            WindowMode::MaximumPreload => "maximum-preload",
            WindowMode::MinimumClampLoad => "minimum-clamp-load",
        },
        governing: match w.governing {
            Governing::MinimumFriction => "minimum_friction",
            Governing::MaximumThreadFriction => "maximum_thread_friction",
            Governing::RequiredClampLoad => "required_clamp_load",
            Governing::AngleWindow => "angle_window",
            Governing::YieldPoint => "yield_point",
        },
        clamp_load: spec.clamp_load.as_ref().map(|c| ClampLoadOut {
            required: o.force(c.required),
            achieved_min: o.force(c.achieved_min),
            embedding_loss: (c.embedding_loss.value > 0.0).then(|| o.force(c.embedding_loss)),
            margin: o.force(c.margin),
            met: c.met,
        }),
        method: MethodOut {
            id: m.id,
            name: m.name,
            tool_scatter: spec.scatter,
            tool_scatter_source: source(spec.scatter_source),
            scatter_reference: m.scatter_source,
            table_a8_tightening_factor: [m.table_a8_alpha_a.0, m.table_a8_alpha_a.1],
            torque_controlled: m.torque_controlled,
        },
        utilisation: spec.utilisation,
        utilisation_source: source(spec.utilisation_source),
        prevailing_torque: o.torque(spec.prevailing_torque),
        fastener: FastenerOut {
            thread: ThreadOut {
                designation: t.designation.clone(),
                form: thread_form(spec),
                series: thread_series(spec),
                nominal_diameter: o.length(t.nominal_diameter),
                pitch: o.length(t.pitch),
                pitch_diameter: o.length(t.pitch_diameter),
                minor_diameter: o.length(t.minor_diameter),
                stress_area: stress_area.clone(),
                flank_angle: o.angle(t.flank_angle),
                custom: t.custom,
            },
            stress_area,
            property_class: GradeOut {
                id: spec.strength.id.clone(),
                standard: spec.strength.standard.clone(),
                tensile_strength_min: o.stress(spec.strength.tensile_strength_min),
                yield_strength_min: o.stress(spec.strength.yield_strength_min),
                yield_basis: yield_basis(spec),
                proof_stress: o.stress(spec.strength.proof_stress),
            },
            proof_load: o.force(spec.proof_load),
            yield_load: o.force(spec.yield_load),
            bearing: BearingOut {
                outer_diameter: o.length(spec.bearing.outer_diameter),
                inner_diameter: o.length(spec.bearing.inner_diameter),
                mean_diameter: o.length(spec.mean_bearing_diameter),
                source: spec.bearing.source.clone(),
                surface_pressure: o.stress(spec.surface_pressure),
            },
        },
        friction: FrictionOut {
            thread: side(
                spec.thread_friction.min(),
                spec.thread_friction.max(),
                &f.thread_origin,
            ),
            bearing: side(
                spec.bearing_friction.min(),
                spec.bearing_friction.max(),
                &f.bearing_origin,
            ),
            finish: f.finish.clone(),
            lubricant: f.lubricant.clone(),
            catalogue_entry: entry_ref(&f.thread_origin).or_else(|| entry_ref(&f.bearing_origin)),
            catalogue_revision: resolved.revision,
            scope: f.scope.as_ref().map(|s| parts::FrictionScopeOut {
                joint_tag: s.joint_tag.clone(),
                reason: s.reason.clone(),
            }),
            source: spec.friction_source.clone(),
        },
        figures: FiguresPair {
            at_min_friction: figures(o, &spec.at_min_friction),
            at_max_friction: figures(o, &spec.at_max_friction),
        },
        clamped_material: spec.clamped_material.as_ref().map(|m| m.id.clone()),
        joint: spec
            .joint_model
            .as_ref()
            .map(|m| joint_out(m, resolved.units)),
        checks: checks_out(&spec.checks),
        cautions: Cautions::of(spec.cautions),
        assumptions,
        catalogue_revision: resolved.revision,
        catalogue_may_be_stale: stale,
        units: resolved.units,
        spec_hash: super::answer_hash(
            &resolved.content_hash,
            match resolved.units {
                Units::Si => "units=si",
                Units::Us => "units=us",
            },
        ),
        service_version: super::SERVICE_VERSION,
        method_version: super::METHOD_VERSION,
    }
}

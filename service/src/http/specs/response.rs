//! Wire response of a tightening spec. Every physical quantity is a
//! `{"value", "unit"}` object in the requested unit system (SI: N, N·m, mm,
//! mm², MPa, degrees; US: lbf, lbf·ft, in, in², ksi, degrees). Built from the
//! engine's `Spec` explicitly (engine types hold uom quantities and are not
//! serialised themselves).

use serde::Serialize;
use utoipa::ToSchema;

use crate::engine::angle::{AngleOutcome, SnugSource};
use crate::engine::checks::Severity;
use crate::engine::spec::{FrictionFigures, Spec, ValueSource, WindowMode};
use crate::engine::window::Governing;

use super::cautions::Cautions;
use super::friction::FrictionOrigin;
use super::request::Units;
use super::resolve::Resolved;
use crate::http::quantity::Quantity;

/// The torque window to set.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct TorqueOut {
    /// Lowest acceptable torque: target·(1 − s).
    pub lower: Quantity,
    /// Torque to set on the tool: upper/(1 + s).
    pub target: Quantity,
    /// Highest acceptable torque; with single friction values and no tool
    /// scatter this is VDI 2230's tightening torque M_A.
    pub upper: Quantity,
    /// Yield-limited torque at minimum friction (equals `upper` unless a
    /// required clamp load chose a lower window).
    pub upper_limit: Quantity,
}

/// The assembly preload the window gives.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct PreloadOut {
    /// At the lower torque and maximum friction.
    pub min: Quantity,
    /// At the upper torque and minimum friction; with single friction values
    /// and no tool scatter this is VDI 2230's F_M,zul.
    pub max: Quantity,
    /// F_M,zul at minimum thread friction (VDI 2230 Part 1).
    pub permissible: Quantity,
}

/// The angle window from snug torque, or why it was not computed.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct AngleOut {
    pub computed: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub min: Option<Quantity>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max: Option<Quantity>,
    /// Angle from snug at which the bolt may first yield: a limit, never a target.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub at_yield: Option<Quantity>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub snug_torque: Option<Quantity>,
    /// `given`, or `default` (30 % of the target torque, common practice).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub snug_torque_source: Option<&'static str>,
    /// Why the angle was not computed.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reason: Option<String>,
}

/// The tightening method and tool scatter used.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct MethodOut {
    pub id: &'static str,
    pub name: &'static str,
    /// Tool scatter ±s as a fraction (0.05 = ±5 %).
    pub tool_scatter: f64,
    /// `given` or `default` (the method's).
    pub tool_scatter_source: &'static str,
    /// Where the method's default scatter comes from.
    pub scatter_reference: &'static str,
    /// VDI 2230 Part 1 Table A8 tightening-factor range of this kind of method.
    pub table_a8_tightening_factor: [f64; 2],
    /// True when the tool controls torque; false when torque is only monitored.
    pub torque_controlled: bool,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct ThreadOut {
    pub designation: String,
    pub form: &'static str,
    pub series: &'static str,
    pub nominal_diameter: Quantity,
    pub pitch: Quantity,
    pub pitch_diameter: Quantity,
    pub minor_diameter: Quantity,
    pub stress_area: Quantity,
    pub flank_angle: Quantity,
    pub custom: bool,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct GradeOut {
    pub id: String,
    pub standard: String,
    pub tensile_strength_min: Quantity,
    pub yield_strength_min: Quantity,
    /// `lower_yield`, `proof_strength02`, `full_size_rpf` or `inch_yield`.
    pub yield_basis: &'static str,
    pub proof_stress: Quantity,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct BearingOut {
    pub outer_diameter: Quantity,
    pub inner_diameter: Quantity,
    /// D_Km = (d_w + d_h)/2.
    pub mean_diameter: Quantity,
    pub source: String,
    /// Surface pressure under the head or nut at preload max.
    pub surface_pressure: Quantity,
}

/// The fastener: thread geometry, grade strengths and loads.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FastenerOut {
    pub thread: ThreadOut,
    /// Convenience copy of `thread.stress_area`.
    pub stress_area: Quantity,
    pub property_class: GradeOut,
    /// Proof load Sp·As.
    pub proof_load: Quantity,
    /// Yield load Rp·As (tension only).
    pub yield_load: Quantity,
    pub bearing: BearingOut,
}

/// A catalogue entry a friction value came from.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct CatalogueEntryRef {
    pub id: i64,
    /// Catalogue revision of the entry's last change.
    pub revision: i64,
    /// The entry's published source.
    pub source: String,
}

/// One friction range used, and where it came from.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FrictionSideOut {
    pub min: f64,
    pub max: f64,
    /// `catalogue` (the entry in `friction.catalogue_entry`) or `request`
    /// (given in the request).
    pub origin: &'static str,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FrictionOut {
    /// Thread friction μ_G (VDI 2230 notation).
    pub thread: FrictionSideOut,
    /// Bearing friction μ_K under the turning head or nut.
    pub bearing: FrictionSideOut,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub finish: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub lubricant: Option<String>,
    /// The catalogue entry the `catalogue` values came from (one entry
    /// gives both thread and bearing friction).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub catalogue_entry: Option<CatalogueEntryRef>,
    /// The catalogue revision the look-up used.
    pub catalogue_revision: i64,
    /// Provenance in words.
    pub source: String,
}

/// Shares of the torque (fractions summing to 1).
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct TorqueSplitOut {
    /// Share that stretches the bolt (tightening efficiency).
    pub pitch: f64,
    pub thread_friction: f64,
    pub bearing_friction: f64,
    pub prevailing: f64,
}

/// Figures at one friction corner and the target torque.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FiguresOut {
    pub thread_friction: f64,
    pub bearing_friction: f64,
    pub preload_at_target: Quantity,
    pub torque_split: TorqueSplitOut,
    /// Nut factor K = M/(F·d), prevailing torque excluded.
    pub nut_factor: f64,
    /// μ_tot: the single friction giving the same torque.
    pub total_friction: f64,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FiguresPair {
    pub at_min_friction: FiguresOut,
    pub at_max_friction: FiguresOut,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct ClampLoadOut {
    pub required: Quantity,
    /// Preload at the low end of the window.
    pub achieved_min: Quantity,
    pub margin: Quantity,
    pub met: bool,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct CheckOut {
    /// Stable machine-readable code, e.g. `surface_pressure_exceeded`.
    pub code: &'static str,
    /// `info`, `warning` or `error`.
    pub severity: &'static str,
    pub message: String,
}

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
    pub checks: Vec<CheckOut>,
    #[schema(value_type = Vec<String>)]
    pub cautions: Cautions,
    pub assumptions: Vec<String>,
    pub catalogue_revision: i64,
    /// True when the database is unreachable and the catalogue may be stale.
    pub catalogue_may_be_stale: bool,
    /// `si` or `us`.
    pub units: Units,
    /// SHA-256 (hex) of the normalised request and the catalogue revision.
    pub spec_hash: String,
}

/// The response's unit system applied to `http::quantity` conversions.
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
    if spec.scatter_source == ValueSource::Default {
        assumptions.push(format!(
            "tool scatter ±{:.0} % from the method default: {}",
            spec.scatter * 100.0,
            m.scatter_source
        ));
    }
    SpecResponse {
        torque: TorqueOut {
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
        },
        clamp_load: spec.clamp_load.as_ref().map(|c| ClampLoadOut {
            required: o.force(c.required),
            achieved_min: o.force(c.achieved_min),
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
            source: spec.friction_source.clone(),
        },
        figures: FiguresPair {
            at_min_friction: figures(o, &spec.at_min_friction),
            at_max_friction: figures(o, &spec.at_max_friction),
        },
        clamped_material: spec.clamped_material.as_ref().map(|m| m.id.clone()),
        checks: spec
            .checks
            .iter()
            .map(|c| CheckOut {
                code: c.code,
                severity: match c.severity {
                    Severity::Info => "info",
                    Severity::Warning => "warning",
                    Severity::Error => "error",
                },
                message: c.message.clone(),
            })
            .collect(),
        cautions: Cautions::all(spec.cautions),
        assumptions,
        catalogue_revision: resolved.revision,
        catalogue_may_be_stale: stale,
        units: resolved.units,
        spec_hash: resolved.content_hash.clone(),
    }
}

//! A complete tightening specification: validated input in, every figure and
//! every assumption out. A spec is auditable from its own output.
//!
//! `compute` runs: validation (`validate`) → torque window (forward, or inverse for a
//! required clamp load, after the embedding loss of the joint model
//! (`joint`)) → clamp-load verdict → working state under loads →
//! torque-angle → figures the trade reads (torque split, nut factor, total
//! friction) → checks.

use uom::si::f64::{Force, Length, Pressure, Torque};
use uom::si::force::newton;
use uom::si::torque::newton_meter;

use super::angle::{angle_window, AngleOutcome, JointInput};
use super::bearing::BearingSurface;
use super::cautions::CautionSet;
use super::checks::{self, Check, CheckInput, MatingParts, TappedHole};
use super::grade::Strength;
use super::joint::controlled::ControlledPreload;
use super::joint::model::{self, Assembled, JointModel, JointModelInput};
use super::material::ClampedMaterial;
use super::method::{MethodInfo, TighteningMethod};
use super::plausible;
use super::quantity::{non_negative, positive, FrictionRange, Scatter, Utilisation};
use super::thread::ThreadGeometry;
use super::tightening::{
    equivalent_total_friction, nut_factor, preload_at_torque, torque_formula, torque_split,
    TorqueFormula, TorqueSplit,
};
use super::window::{
    clamp_load_verdict, clamp_load_window, maximum_window, ClampLoadVerdict, TorqueWindow,
    WindowInput,
};
use super::EngineError;

mod controlled;
mod finite;
mod joint;
mod validate;
pub use validate::is_stainless_grade;
use validate::{validate_bearing, validate_strength, validate_thread};

/// How the window is chosen.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum WindowMode {
    /// Use the bolt up to ν·Rp at the top of the window (VDI 2230 practice).
    #[default]
    MaximumPreload,
    /// The lowest window that still guarantees `required_clamp_load`.
    MinimumClampLoad,
}

/// Facts about the parts that only the catalogue or the user knows.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SpecFlags {
    /// The fastener finish is electroplated (zinc, zinc-nickel, cadmium...).
    pub electroplated: bool,
    /// The finish is hot-dip galvanized (ISO 10684).
    pub hot_dip_galvanized: bool,
    /// The parts were phosphated or otherwise acid-cleaned.
    pub acid_cleaned: bool,
    /// Assembled without lubricant.
    pub dry: bool,
    /// Friction range the data was measured in, where known.
    pub measured_thread_friction: Option<FrictionRange>,
    pub measured_bearing_friction: Option<FrictionRange>,
    /// The bolt was described (`bolt`): its shank sections inside the clamp
    /// length are in the joint's resilience. False: taken as fully threaded.
    pub bolt_described: bool,
}

/// Everything a spec is computed from. Thread, strength and bearing come from
/// their modules already validated; the rest is validated by [`compute`].
#[derive(Debug, Clone, PartialEq)]
pub struct SpecInput {
    pub thread: ThreadGeometry,
    pub strength: Strength,
    pub bearing: BearingSurface,
    pub thread_friction: FrictionRange,
    pub bearing_friction: FrictionRange,
    /// Where the friction values come from, in words (catalogue entry, test...).
    pub friction_source: String,
    pub method: TighteningMethod,
    /// Tool scatter ±s override in [0, 0.5); default: the method's.
    pub scatter: Option<f64>,
    /// Utilisation ν in (0, 1]; default 0.9 (VDI 2230 Part 1).
    pub utilisation: Option<f64>,
    /// Prevailing torque of a locking nut or patch.
    pub prevailing_torque: Option<Torque>,
    /// Material of the clamped parts (surface pressure, modulus for the angle).
    pub clamped_material: Option<ClampedMaterial>,
    /// The joint, for torque-angle.
    pub joint: Option<JointInput>,
    /// Tapped hole thread engagement, for the stripping check.
    pub tapped_hole: Option<TappedHole>,
    /// Nut, tapped part, washer and values from a joint test.
    pub parts: MatingParts,
    pub required_clamp_load: Option<Force>,
    pub window_mode: WindowMode,
    pub flags: SpecFlags,
    /// Clamped stack, roughness, load introduction, operating loads.
    pub joint_model: JointModelInput,
}

/// Whether a value was given or defaulted.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ValueSource {
    Given,
    Default,
}

/// Figures the trade reads, at one friction corner and the target torque.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FrictionFigures {
    pub thread_friction: f64,
    pub bearing_friction: f64,
    /// Preload the target torque gives at these frictions.
    pub preload_at_target: Force,
    pub split: TorqueSplit,
    /// K = M_A/(F·d), prevailing torque excluded.
    pub nut_factor: f64,
    /// μ_tot, the single friction giving the same torque.
    pub total_friction: f64,
}

/// The complete specification.
#[derive(Debug, Clone, PartialEq)]
pub struct Spec {
    pub thread: ThreadGeometry,
    pub strength: Strength,
    /// Proof load Sp·As.
    pub proof_load: Force,
    /// Yield load Rp·As (tension only, no torsion).
    pub yield_load: Force,
    pub bearing: BearingSurface,
    pub mean_bearing_diameter: Length,
    /// Surface pressure under head or nut at preload max.
    pub surface_pressure: Pressure,
    pub clamped_material: Option<ClampedMaterial>,
    pub thread_friction: FrictionRange,
    pub bearing_friction: FrictionRange,
    pub friction_source: String,
    pub method: &'static MethodInfo,
    pub scatter: f64,
    pub scatter_source: ValueSource,
    pub utilisation: f64,
    pub utilisation_source: ValueSource,
    pub prevailing_torque: Torque,
    pub torque_formula: TorqueFormula,
    pub window_mode: WindowMode,
    pub window: TorqueWindow,
    pub clamp_load: Option<ClampLoadVerdict>,
    pub joint: Option<JointInput>,
    pub angle: AngleOutcome,
    /// Resilience, load factor, embedding and working state, where the
    /// joint is described.
    pub joint_model: Option<JointModel>,
    /// Yield- or angle-controlled tightening: the preload model the window
    /// comes from (α_A, R_p0.2max assumed); `None` for torque control.
    pub controlled: Option<ControlledPreload>,
    pub at_min_friction: FrictionFigures,
    pub at_max_friction: FrictionFigures,
    pub checks: Vec<Check>,
    /// The cautions that apply to this spec.
    pub cautions: CautionSet,
}

fn figures(w: &WindowInput, target: Torque, mu_th: f64, mu_b: f64) -> FrictionFigures {
    let (t, dkm, mp) = (w.thread, w.mean_bearing_diameter, w.prevailing_torque);
    let preload = preload_at_torque(t, target, dkm, mu_th, mu_b, mp);
    FrictionFigures {
        thread_friction: mu_th,
        bearing_friction: mu_b,
        preload_at_target: preload,
        split: torque_split(t, preload, dkm, mu_th, mu_b, mp),
        nut_factor: nut_factor(t, dkm, mu_th, mu_b),
        total_friction: equivalent_total_friction(t, dkm, mu_th, mu_b),
    }
}

/// Compute a complete specification, or say exactly which input is wrong.
pub fn compute(input: &SpecInput) -> Result<Spec, EngineError> {
    let spec = compute_unchecked(input)?;
    if !finite::all_finite(&spec) {
        return Err(EngineError::invalid(
            "request",
            "these inputs give a figure that is not a finite number; check the sizes and \
             units given",
        ));
    }
    Ok(spec)
}

fn compute_unchecked(input: &SpecInput) -> Result<Spec, EngineError> {
    validate_thread(&input.thread)?;
    validate_strength(&input.strength)?;
    validate_bearing(&input.bearing)?;
    if let Some(first) = plausible::problems(input).into_iter().next() {
        return Err(first);
    }
    let method = input.method.info();
    let (scatter, scatter_source) = match input.scatter {
        Some(s) => (Scatter::new(s, "scatter")?, ValueSource::Given),
        None => (
            Scatter::new(method.default_scatter, "scatter")?,
            ValueSource::Default,
        ),
    };
    let (nu, utilisation_source) = match input.utilisation {
        Some(v) => (Utilisation::new(v, "utilisation")?, ValueSource::Given),
        None => (Utilisation::DEFAULT, ValueSource::Default),
    };
    let prevailing = match input.prevailing_torque {
        Some(t) => Torque::new::<newton_meter>(non_negative(t.value, "prevailing_torque")?),
        None => Torque::new::<newton_meter>(0.0),
    };
    if let Some(f) = input.required_clamp_load {
        positive(f.value, "required_clamp_load")?;
    }
    if let Some(t) = &input.tapped_hole {
        positive(t.engagement_length.value, "joint.engagement_length")?;
        positive(t.min_engagement_factor, "joint.engagement_length")?;
    }

    let thread = &input.thread;
    let w_in = WindowInput {
        thread,
        yield_strength: input.strength.yield_strength_min,
        mean_bearing_diameter: input.bearing.friction_diameter(),
        thread_friction: input.thread_friction,
        bearing_friction: input.bearing_friction,
        scatter,
        utilisation: nu,
        prevailing_torque: prevailing,
    };
    let joint = joint::prepare(input)?;
    let mut joint_model =
        model::assembly(thread, &input.bearing, joint.as_ref(), &input.joint_model)?;
    let loss = model::embedding_loss(joint_model.as_ref());
    let window = match (input.window_mode, input.required_clamp_load) {
        _ if !method.torque_controlled => maximum_window(&w_in)?,
        (WindowMode::MaximumPreload, _) => maximum_window(&w_in)?,
        // The lowest window whose clamp load after embedding still suffices.
        (WindowMode::MinimumClampLoad, Some(req)) => clamp_load_window(&w_in, req + loss)?
            .map_err(|none| EngineError::invalid("required_clamp_load", none.explanation()))?,
        (WindowMode::MinimumClampLoad, None) => {
            return Err(EngineError::invalid(
                "required_clamp_load",
                "a required clamp load is needed to compute the minimum window",
            ))
        }
    };
    let (window, angle, controlled) =
        match controlled::controlled(input, &w_in, &window, joint.as_ref(), loss)? {
            Some(c) => (c.window, c.angle, Some(c.preload)),
            None => {
                let angle = match &joint {
                    Some(j) => angle_window(&w_in, &input.bearing, j, &window)?,
                    None => AngleOutcome::NotComputed {
                        reason: "no joint given (clamp length, clamped material, outer \
                                 diameter): the angle depends on the joint's resilience and \
                                 is never guessed"
                            .into(),
                    },
                };
                (window, angle, None)
            }
        };
    let clamp_load = input
        .required_clamp_load
        .map(|req| clamp_load_verdict(&window, req).after_embedding(loss));
    if let Some(m) = joint_model.as_mut() {
        let assembled = Assembled {
            thread,
            strength: &input.strength,
            bearing: &input.bearing,
            window: &window,
            thread_friction: input.thread_friction,
            clamped_material: input.clamped_material.as_ref(),
        };
        model::working(m, input.joint_model.loads.as_ref(), &assembled)?;
    }

    let (th, b) = (input.thread_friction, input.bearing_friction);
    let at_min_friction = figures(&w_in, window.target, th.min(), b.min());
    let at_max_friction = figures(&w_in, window.target, th.max(), b.max());

    let mut checks = checks::run(&CheckInput {
        thread,
        strength: &input.strength,
        bearing: &input.bearing,
        window: &window,
        method: input.method,
        clamp_load: clamp_load.as_ref(),
        permissible_surface_pressure: input
            .clamped_material
            .as_ref()
            .and_then(|m| m.permissible_surface_pressure),
        tapped_hole: input.tapped_hole,
        thread_friction: th,
        bearing_friction: b,
        measured_thread_friction: input.flags.measured_thread_friction,
        measured_bearing_friction: input.flags.measured_bearing_friction,
        electroplated: input.flags.electroplated,
        hot_dip_galvanized: input.flags.hot_dip_galvanized,
        acid_cleaned: input.flags.acid_cleaned,
        dry: input.flags.dry,
        stainless: is_stainless_grade(&input.strength.id),
        bolt_described: input.flags.bolt_described,
        angle: match &angle {
            AngleOutcome::Computed(a) => Some(a),
            AngleOutcome::NotComputed { .. } => None,
        },
        parts: &input.parts,
        outside_method: plausible::outside_method_material(input).map(|(_, m)| m),
    });
    checks.extend(plausible::warnings(input, &window, scatter.value()));

    if let Some(w) = joint_model.as_ref().and_then(|m| m.working.as_ref()) {
        checks.extend(w.checks.iter().cloned());
    }
    let angle_given = matches!(angle, AngleOutcome::Computed(_));
    let into_plastic_range = method.method == TighteningMethod::YieldControlled
        || checks
            .iter()
            .any(|c| c.code == checks::ANGLE_MAY_YIELD || c.code == checks::ANGLE_PAST_BOLT_YIELD);
    let cautions = CautionSet::for_spec(angle_given, into_plastic_range);
    let area = thread.stress_area.value;
    Ok(Spec {
        thread: thread.clone(),
        strength: input.strength.clone(),
        proof_load: Force::new::<newton>(input.strength.proof_stress.value * area),
        yield_load: Force::new::<newton>(input.strength.yield_strength_min.value * area),
        bearing: input.bearing.clone(),
        mean_bearing_diameter: input.bearing.friction_diameter(),
        surface_pressure: checks::surface_pressure_value(&input.bearing, &window),
        clamped_material: input.clamped_material.clone(),
        thread_friction: th,
        bearing_friction: b,
        friction_source: input.friction_source.clone(),
        method,
        scatter: scatter.value(),
        scatter_source,
        utilisation: nu.value(),
        utilisation_source,
        prevailing_torque: prevailing,
        torque_formula: torque_formula(thread),
        window_mode: input.window_mode,
        window,
        clamp_load,
        joint,
        angle,
        joint_model,
        controlled,
        at_min_friction,
        at_max_friction,
        checks,
        cautions,
    })
}

#[cfg(test)]
mod end_to_end;
#[cfg(test)]
mod partners;
#[cfg(test)]
pub(crate) mod tests;

//! Physical quantities on the wire: `{"value": number, "unit": "..."}`.
//!
//! Outgoing: SI by default (N, N·m, mm, mm², MPa, degrees); `units=us`
//! gives lbf, lbf·ft (or lbf·in where asked), in, in², ksi. Incoming: a
//! value with its unit, read into a uom quantity; a unit that is unknown or
//! of the wrong kind is refused naming the field. The `read_*` functions
//! give the bare [`Misread`] so that a caller collecting many problems (the
//! friction-test series) can word them as its own error type.
//!
//! Conversion factors are the exact definitions of NIST SP 811 Appendix B:
//! 1 lbf = 4.448 221 615 260 5 N and 1 in = 25.4 mm, rather than uom's
//! rounded `pound_force` (4.448 222 N); lbf·in, lbf·ft and psi are derived
//! from these two; ksi = 1000 psi.
//!
//! The unit spellings a client may write are listed in `unit_table`.

use std::borrow::Cow;

use serde::{Deserialize, Serialize};
use uom::si::f64::{Angle, Area, Force, Length, Pressure, Torque};
use uom::si::{angle, area, force, length, pressure, torque};
use utoipa::ToSchema;

use super::error::FieldProblem;

mod unit_table;
use unit_table::{lookup, Unit};

/// 1 lbf in N (exact by definition, NIST SP 811 Appendix B).
pub const N_PER_LBF: f64 = 4.448_221_615_260_5;
/// 1 in in mm (exact by definition, NIST SP 811 Appendix B).
pub const MM_PER_IN: f64 = 25.4;
/// 1 lbf·in in N·m: 4.448 221 615 260 5 N × 0.0254 m (NIST SP 811 Appendix B).
const NM_PER_LBF_IN: f64 = N_PER_LBF * MM_PER_IN / 1000.0;
/// 1 lbf·ft in N·m: 4.448 221 615 260 5 N × 0.3048 m (NIST SP 811 Appendix B).
const NM_PER_LBF_FT: f64 = NM_PER_LBF_IN * 12.0;
/// 1 psi in MPa: 1 lbf on 1 in² = 4.448 221 615 260 5 N / 645.16 mm²
/// (about 0.006 894 757, NIST SP 811 Appendix B).
const MPA_PER_PSI: f64 = N_PER_LBF / (MM_PER_IN * MM_PER_IN);

/// A physical quantity with its unit.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct Quantity {
    /// The number, in `unit`.
    pub value: f64,
    /// The unit symbol, e.g. `N`, `N·m`, `mm`, `mm²`, `MPa`, `degrees`,
    /// `lbf`, `lbf·ft`, `lbf·in`, `in`, `in²`, `ksi`. Borrowed for the
    /// service's own output (no allocation per quantity), owned when read.
    #[schema(value_type = String)]
    pub unit: Cow<'static, str>,
}

/// Which unit system responses use.
#[derive(
    Debug, Clone, Copy, Default, PartialEq, Eq, Serialize, Deserialize, ToSchema, clap::ValueEnum,
)]
#[serde(rename_all = "lowercase")]
pub enum Units {
    /// N, N·m, mm, mm², MPa, degrees.
    #[default]
    Si,
    /// lbf, lbf·ft, in, in², ksi, degrees.
    Us,
}

/// Unit for torques given to tool controllers.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TorqueUnit {
    NewtonMetre,
    PoundForceFoot,
    PoundForceInch,
}

impl TorqueUnit {
    /// The symbol used in responses.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::NewtonMetre => "N·m",
            Self::PoundForceFoot => "lbf·ft",
            Self::PoundForceInch => "lbf·in",
        }
    }

    /// The default torque unit of a unit system.
    pub fn of(units: Units) -> Self {
        match units {
            Units::Si => Self::NewtonMetre,
            Units::Us => Self::PoundForceFoot,
        }
    }

    /// Reads a torque unit (`N·m`, `N*m`, `N.m`, `Nm`, `lbf·ft`, `lbf.ft`,
    /// `ft·lbf`, `lbf·in`, `lbf.in`, `in·lbf`, ...).
    pub fn parse(field: &str, text: &str) -> Result<Self, FieldProblem> {
        match lookup(text) {
            Some(Unit::Torque(u, 1.0)) => Ok(u),
            _ => {
                Err(Misread::wrong_unit(text, "a torque", "N·m, lbf·ft, lbf·in")
                    .into_problem(field))
            }
        }
    }

    /// N·m in one of this unit.
    fn newton_metres(self) -> f64 {
        match self {
            Self::NewtonMetre => 1.0,
            Self::PoundForceFoot => NM_PER_LBF_FT,
            Self::PoundForceInch => NM_PER_LBF_IN,
        }
    }

    fn value_of(self, t: Torque) -> f64 {
        t.get::<torque::newton_meter>() / self.newton_metres()
    }

    fn to_torque(self, v: f64) -> Torque {
        Torque::new::<torque::newton_meter>(v * self.newton_metres())
    }
}

/// Why a posted quantity could not be read, before it is tied to a field
/// and to an error type.
#[derive(Debug, Clone, PartialEq)]
pub enum Misread {
    /// The value is NaN or infinite.
    NotFinite,
    /// The unit is unknown or of another kind of quantity.
    WrongUnit {
        given: String,
        /// The kind asked for, with its article (`a force`, `an area`).
        kind: &'static str,
        accepted: &'static str,
    },
}

impl Misread {
    fn wrong_unit(given: &str, kind: &'static str, accepted: &'static str) -> Self {
        Self::WrongUnit {
            given: given.to_string(),
            kind,
            accepted,
        }
    }

    /// The part of the quantity at fault: `value` or `unit`.
    pub fn part(&self) -> &'static str {
        match self {
            Self::NotFinite => "value",
            Self::WrongUnit { .. } => "unit",
        }
    }

    /// Why it was refused, in words for the client.
    pub fn reason(&self) -> String {
        match self {
            Self::NotFinite => "the value must be a finite number".to_string(),
            Self::WrongUnit {
                given,
                kind,
                accepted,
            } => format!("unit '{given}' is not {kind} unit; use one of {accepted}"),
        }
    }

    /// The field at fault (`{field}.value` or `{field}.unit`) and the reason.
    pub fn field_and_reason(&self, field: &str) -> (String, String) {
        (format!("{field}.{}", self.part()), self.reason())
    }

    /// A malformed-field problem naming `{field}.value` or `{field}.unit`.
    pub fn into_problem(self, field: &str) -> FieldProblem {
        let (field, reason) = self.field_and_reason(field);
        FieldProblem::malformed(field, reason)
    }
}

impl Quantity {
    /// A quantity; the value is kept to 12 significant digits so unit
    /// conversions print as `60` rather than `59.99999999999999`.
    pub fn new(value: f64, unit: &'static str) -> Self {
        Self {
            value: tidy(value),
            unit: Cow::Borrowed(unit),
        }
    }

    pub fn force(f: Force, units: Units) -> Self {
        match units {
            Units::Si => Self::new(f.get::<force::newton>(), "N"),
            Units::Us => Self::new(f.get::<force::newton>() / N_PER_LBF, "lbf"),
        }
    }

    /// A torque in the unit system's default unit (N·m or lbf·ft).
    pub fn torque(t: Torque, units: Units) -> Self {
        Self::torque_in(t, TorqueUnit::of(units))
    }

    pub fn torque_in(t: Torque, unit: TorqueUnit) -> Self {
        Self::new(unit.value_of(t), unit.symbol())
    }

    pub fn length(l: Length, units: Units) -> Self {
        match units {
            Units::Si => Self::new(l.get::<length::millimeter>(), "mm"),
            Units::Us => Self::new(l.get::<length::inch>(), "in"),
        }
    }

    /// A surface roughness (µm or µin).
    pub fn roughness(l: Length, units: Units) -> Self {
        match units {
            Units::Si => Self::new(l.get::<length::micrometer>(), "µm"),
            Units::Us => Self::new(l.get::<length::millimeter>() * 1e6 / MM_PER_IN, "µin"),
        }
    }

    /// A resilience δ (elastic length change per force), from m/N: mm/N or in/lbf.
    pub fn resilience(metre_per_newton: f64, units: Units) -> Self {
        let mm_per_n = metre_per_newton * 1000.0;
        match units {
            Units::Si => Self::new(mm_per_n, "mm/N"),
            Units::Us => Self::new(mm_per_n * N_PER_LBF / MM_PER_IN, "in/lbf"),
        }
    }

    pub fn area(a: Area, units: Units) -> Self {
        match units {
            Units::Si => Self::new(a.get::<area::square_millimeter>(), "mm²"),
            Units::Us => Self::new(a.get::<area::square_inch>(), "in²"),
        }
    }

    /// A stress or surface pressure (MPa or ksi).
    pub fn stress(p: Pressure, units: Units) -> Self {
        match units {
            Units::Si => Self::new(p.get::<pressure::megapascal>(), "MPa"),
            Units::Us => Self::new(
                p.get::<pressure::megapascal>() / (1000.0 * MPA_PER_PSI),
                "ksi",
            ),
        }
    }

    /// Angles are in degrees in both systems.
    pub fn angle(a: Angle) -> Self {
        Self::new(a.get::<angle::degree>(), "degrees")
    }

    fn checked_value(&self) -> Result<f64, Misread> {
        if self.value.is_finite() {
            Ok(self.value)
        } else {
            Err(Misread::NotFinite)
        }
    }

    /// Reads a length (mm, cm, m, in, ft).
    pub fn read_length(&self) -> Result<Length, Misread> {
        let v = self.checked_value()?;
        match lookup(&self.unit) {
            Some(Unit::Length(f)) => Ok(Length::new::<length::millimeter>(v * f)),
            _ => Err(Misread::wrong_unit(
                &self.unit,
                "a length",
                "mm, cm, m, in, ft",
            )),
        }
    }

    /// Reads an area (mm², in²).
    pub fn read_area(&self) -> Result<Area, Misread> {
        let v = self.checked_value()?;
        match lookup(&self.unit) {
            Some(Unit::Area(f)) => Ok(Area::new::<area::square_millimeter>(v * f)),
            _ => Err(Misread::wrong_unit(&self.unit, "an area", "mm², in²")),
        }
    }

    /// Reads a force (N, kN, MN, lbf, kip).
    pub fn read_force(&self) -> Result<Force, Misread> {
        let v = self.checked_value()?;
        match lookup(&self.unit) {
            Some(Unit::Force(f)) => Ok(Force::new::<force::newton>(v * f)),
            _ => Err(Misread::wrong_unit(
                &self.unit,
                "a force",
                "N, kN, MN, lbf, kip",
            )),
        }
    }

    /// Reads a torque (N·m, kN·m, N·mm, lbf·ft, lbf·in).
    pub fn read_torque(&self) -> Result<Torque, Misread> {
        let v = self.checked_value()?;
        match lookup(&self.unit) {
            Some(Unit::Torque(u, scale)) => Ok(u.to_torque(v * scale)),
            _ => Err(Misread::wrong_unit(
                &self.unit,
                "a torque",
                "N·m, N·mm, kN·m, lbf·ft, lbf·in",
            )),
        }
    }

    /// Reads a stress (MPa, N/mm², GPa, ksi, psi).
    pub fn read_stress(&self) -> Result<Pressure, Misread> {
        let v = self.checked_value()?;
        match lookup(&self.unit) {
            Some(Unit::Stress(f)) => Ok(Pressure::new::<pressure::megapascal>(v * f)),
            _ => Err(Misread::wrong_unit(
                &self.unit,
                "a stress",
                "MPa, N/mm², GPa, ksi, psi",
            )),
        }
    }

    /// Reads an angle (degrees, rad).
    pub fn read_angle(&self) -> Result<Angle, Misread> {
        let v = self.checked_value()?;
        match lookup(&self.unit) {
            Some(Unit::Angle(f)) => Ok(Angle::new::<angle::degree>(v * f)),
            _ => Err(Misread::wrong_unit(&self.unit, "an angle", "degrees, rad")),
        }
    }

    /// [`Self::read_length`], refused as a malformed field.
    pub fn to_length(&self, field: &str) -> Result<Length, FieldProblem> {
        self.read_length().map_err(|m| m.into_problem(field))
    }

    /// [`Self::read_area`], refused as a malformed field.
    pub fn to_area(&self, field: &str) -> Result<Area, FieldProblem> {
        self.read_area().map_err(|m| m.into_problem(field))
    }

    /// [`Self::read_force`], refused as a malformed field.
    pub fn to_force(&self, field: &str) -> Result<Force, FieldProblem> {
        self.read_force().map_err(|m| m.into_problem(field))
    }

    /// [`Self::read_torque`], refused as a malformed field.
    pub fn to_torque(&self, field: &str) -> Result<Torque, FieldProblem> {
        self.read_torque().map_err(|m| m.into_problem(field))
    }

    /// [`Self::read_stress`], refused as a malformed field.
    pub fn to_stress(&self, field: &str) -> Result<Pressure, FieldProblem> {
        self.read_stress().map_err(|m| m.into_problem(field))
    }

    /// [`Self::read_angle`], refused as a malformed field.
    pub fn to_angle(&self, field: &str) -> Result<Angle, FieldProblem> {
        self.read_angle().map_err(|m| m.into_problem(field))
    }
}

/// Rounds to 12 significant digits (far below any measurement's
/// resolution; removes binary floating-point noise from conversions).
fn tidy(v: f64) -> f64 {
    if v == 0.0 || !v.is_finite() {
        return v;
    }
    let digits = 11 - v.abs().log10().floor() as i32;
    if !(-300..=300).contains(&digits) {
        return v;
    }
    let scale = 10f64.powi(digits);
    let rounded = (v * scale).round() / scale;
    if rounded.is_finite() {
        rounded
    } else {
        v
    }
}

#[cfg(test)]
#[path = "quantity_tests.rs"]
mod tests;

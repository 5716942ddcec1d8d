//! Load factor of the joint: how much of an axial working load reaches the
//! bolt. Φ_K = δ_P/(δ_S + δ_P) for load introduced under the head and nut
//! (VDI 2230 Part 1:2003 §5.2.2, recalled from memory), and Φ = n·Φ_K with
//! the load-introduction factor n (same section), which places the load
//! introduction inside the clamped parts.

use crate::engine::quantity::positive;
use crate::engine::EngineError;

/// Load-introduction factor used when the request gives none: n = 0.5,
/// common practice for a load introduced about mid-way in the clamped parts
/// (VDI 2230 Part 1:2003 §5.2.2 gives n from the joint geometry; 0.5 is the
/// usual estimate where that geometry is not described).
pub const DEFAULT_LOAD_INTRODUCTION: f64 = 0.5;

/// The load factors of a joint.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LoadFactor {
    /// δ_S of the bolt, m/N.
    pub bolt_resilience: f64,
    /// δ_P of the clamped parts, m/N.
    pub clamped_resilience: f64,
    /// Φ_K = δ_P/(δ_S + δ_P).
    pub load_factor_k: f64,
    /// n in (0, 1].
    pub load_introduction: f64,
    /// True when n was not given and [`DEFAULT_LOAD_INTRODUCTION`] was used.
    pub load_introduction_defaulted: bool,
    /// Φ = n·Φ_K.
    pub load_factor: f64,
}

/// Φ_K and Φ = n·Φ_K from the resiliences (m/N). `n` outside (0, 1] is
/// refused naming `load_introduction`.
pub fn load_factor(
    bolt_resilience: f64,
    clamped_resilience: f64,
    load_introduction: Option<f64>,
) -> Result<LoadFactor, EngineError> {
    let ds = positive(bolt_resilience, "bolt")?;
    let dp = positive(clamped_resilience, "clamped_parts")?;
    let (n, defaulted) = match load_introduction {
        Some(n) if n.is_finite() && n > 0.0 && n <= 1.0 => (n, false),
        Some(n) => {
            return Err(EngineError::invalid(
                "load_introduction",
                format!(
                    "the load-introduction factor n must be greater than 0 and at most 1 \
                     (1: load introduced under head and nut), got {n}"
                ),
            ))
        }
        None => (DEFAULT_LOAD_INTRODUCTION, true),
    };
    let phi_k = dp / (ds + dp);
    Ok(LoadFactor {
        bolt_resilience: ds,
        clamped_resilience: dp,
        load_factor_k: phi_k,
        load_introduction: n,
        load_introduction_defaulted: defaulted,
        load_factor: n * phi_k,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Ugural, Mechanical Design of Machine Components, Example 15.5:
    /// k_b = 0.221·E_s, k_p = 0.368·E_s, joint constant C = 0.375. With
    /// δ = 1/k, Φ_K = δ_P/(δ_S + δ_P) = k_b/(k_b + k_p) is that constant.
    #[test]
    fn load_factor_matches_the_published_joint_constant() {
        let lf = load_factor(1.0 / 0.221, 1.0 / 0.368, Some(1.0)).unwrap();
        assert!(
            (lf.load_factor_k - 0.375).abs() < 0.0005,
            "{}",
            lf.load_factor_k
        );
        assert_eq!(lf.load_factor, lf.load_factor_k);
        assert!(!lf.load_introduction_defaulted);
    }

    #[test]
    fn default_n_is_one_half_and_stated() {
        let lf = load_factor(2.769e-9, 6.278e-10, None).unwrap();
        assert!(lf.load_introduction_defaulted);
        assert_eq!(lf.load_introduction, DEFAULT_LOAD_INTRODUCTION);
        assert!((lf.load_factor - 0.5 * lf.load_factor_k).abs() < 1e-15);
        // Hand check, δ_P/(δ_S + δ_P) = 6.278/(27.69 + 6.278) = 0.1848.
        assert!((lf.load_factor_k - 0.1848).abs() < 0.0001);
    }

    #[test]
    fn n_outside_zero_to_one_is_refused() {
        for bad in [0.0, -0.1, 1.0001, f64::NAN, f64::INFINITY] {
            let e = load_factor(1e-9, 1e-9, Some(bad)).unwrap_err();
            assert_eq!(e.field(), "load_introduction", "{bad}");
        }
        assert!(load_factor(1e-9, 1e-9, Some(1.0)).is_ok());
        assert_eq!(load_factor(0.0, 1e-9, None).unwrap_err().field(), "bolt");
        assert_eq!(
            load_factor(1e-9, f64::NAN, None).unwrap_err().field(),
            "clamped_parts"
        );
    }
}

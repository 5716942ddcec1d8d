//! The answer's assumptions that depend on the method and on the bolt's
//! partners, in words.

use crate::engine::spec::Spec;

/// What an angle- or yield-controlled answer rests on, in words.
pub(super) fn controlled_assumptions(spec: &Spec, out: &mut Vec<String>) {
    use crate::engine::method::TighteningMethod as M;
    let Some(p) = &spec.controlled else { return };
    let rp_max = p.yield_max.get::<uom::si::pressure::megapascal>();
    match spec.method.method {
        M::YieldControlled => {
            out.push(format!(
                "preload of yield-controlled tightening: the yield point under tension and \
                 thread torsion (VDI 2230 Part 1:2003 §5.4.3, recalled from memory), F_M,min at \
                 the minimum yield strength and highest thread friction, F_M,max at R_p0.2max = \
                 {rp_max:.0} N/mm² and the lowest thread friction; the torque band is the torque \
                 at which yield is reached over the friction and yield ranges (monitoring, not a \
                 setting)"
            ));
            if p.yield_max_defaulted {
                out.push(
                    "R_p0.2max taken as 1.2 × the minimum yield strength (the property class \
                     gives no upper yield strength; recalled from memory, common practice)"
                        .to_string(),
                );
            }
        }
        _ => out.push(format!(
            "preload of torque-angle tightening: the snug preload over the friction range plus \
             ΔF = θ·P/(360°·(δ_S + δ_P)) over the angle window ±{:.0} % (VDI 2230 Part 1 \
             elastic model, recalled from memory); the window's upper end brings the highest \
             snug preload to F_M,zul at ν = {} and the highest thread friction; the torque \
             band is the final torque over the friction range and the angle window \
             (monitoring, not a setting)",
            spec.scatter * 100.0,
            spec.utilisation
        )),
    }
}

/// What the answer assumed about the nut, the tapped part, the washer and a
/// prevailing torque, in words.
pub(super) fn partner_assumptions(input: &crate::engine::spec::SpecInput) -> Vec<String> {
    let mut out = Vec::new();
    let parts = &input.parts;
    let tapped = input.tapped_hole.is_some()
        || input
            .joint
            .as_ref()
            .is_some_and(|j| j.joint_type == crate::engine::angle::JointType::TappedHole);
    if let Some(n) = &parts.nut {
        out.push(format!(
            "nut: {} ({}), of the standard's own height; made for {}",
            n.name, n.standard, n.mates
        ));
    } else if !tapped {
        out.push(
            "nut: not given; a nut of the class made for this bolt (ISO 898-2 pairing, e.g. \
             class 10 for 10.9) and of the standard's height is assumed, and the nut is not \
             checked (give nut.property_class to have it checked)"
                .to_string(),
        );
    }
    if let Some(t) = &input.tapped_hole {
        out.push(format!(
            "tapped hole: thread engagement {:.1} mm ({}) against at least {:.2}·d for the \
             tapped part's material",
            t.engagement_length.value * 1e3,
            if t.engagement_given {
                "given".to_string()
            } else {
                format!(
                    "not given: {}·d assumed, common practice",
                    crate::engine::checks::DEFAULT_TAPPED_ENGAGEMENT_PER_D
                )
            },
            t.min_engagement_factor
        ));
    }
    if let Some(w) = &parts.washer {
        out.push(format!(
            "washer: the head presses on the washer, the washer on the part: {}",
            w.source
        ));
    }
    if input.prevailing_torque.is_some_and(|t| t.value > 0.0) {
        out.push(
            "prevailing torque: reacted in the thread, it twists the bolt like the thread \
             torque and lowers F_M,zul (added to the torsion of VDI 2230 Part 1 eq. R13/5.5/48)"
                .to_string(),
        );
    }
    out
}

#[cfg(test)]
mod tests {
    use super::partner_assumptions;
    use crate::engine::angle::JointType;
    use crate::engine::spec::tests::m10_input;
    use crate::engine::tightening::fixtures::steel_joint;

    fn says_nut_assumed(lines: &[String]) -> bool {
        lines.iter().any(|l| l.starts_with("nut: not given"))
    }

    /// Without a nut a through-bolted answer says which nut it assumed and
    /// that it was not checked; a tapped hole has no nut to assume.
    #[test]
    fn a_missing_nut_is_stated_for_through_bolted_joints_only() {
        let input = m10_input();
        assert!(input.parts.nut.is_none());
        assert!(says_nut_assumed(&partner_assumptions(&input)));

        let mut tapped = m10_input();
        let mut joint = steel_joint(20.0, Vec::new(), false);
        joint.joint_type = JointType::TappedHole;
        tapped.joint = Some(joint);
        assert!(!says_nut_assumed(&partner_assumptions(&tapped)));
    }
}

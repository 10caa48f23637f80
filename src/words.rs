//! The words for typed results, shared by the command line and the interface.
//!
//! The physics returns numbers and enum variants ([`Caution`]); this layer
//! says them to a person, in the chosen unit system, with the rule behind each.

use crate::physics::checks::Caution;
use crate::units::{format_quantity, Dimension as D, UnitSystem};

/// A practice caution in words, numbers in `units`.
pub fn caution(c: &Caution, units: UnitSystem) -> String {
    let q = |dim, v| format_quantity(dim, v, units);
    match *c {
        Caution::LowStartMargin { margin, min } => format!(
            "thin start margin {margin:.2} (stall over breakaway torque; {min} or more is common \
             practice): wear, grit or a pressure drop may keep it from starting"
        ),
        Caution::FastSpin { rpm, max_rpm } => format!(
            "runs at {rpm:.0} rpm: rotating-arm sprinklers run at tens to a few hundred rpm, and \
             over {max_rpm:.0} rpm wears a plain thrust bearing fast (common practice); add a brake"
        ),
        Caution::FastTip {
            tip_speed_m_s,
            max_m_s,
        } => format!(
            "arm tips move at {}: above {} the arms, tip masses and bearing take more than such a \
             construction plausibly does, and the jets break into mist (common practice); slow it \
             with a brake",
            q(D::Speed, tip_speed_m_s),
            q(D::Speed, max_m_s)
        ),
        Caution::SpinPressure {
            arm,
            nozzle_pa,
            inlet_pa,
            max_ratio,
        } => format!(
            "spin raises the pressure at the nozzle on arm {} to {}, {:.1} times the inlet's {} \
             (above {max_ratio} times, the speed rather than the supply sets the flow); slow it down",
            arm + 1,
            q(D::Pressure, nozzle_pa),
            nozzle_pa / inlet_pa,
            q(D::Pressure, inlet_pa)
        ),
        Caution::QuickSpinUp {
            t90_s,
            min_s,
            inertia_kg_m2,
        } => format!(
            "reaches 90 % of its speed in {t90_s:.3} s: under {min_s} s is faster than a real \
             rotor (common practice); the inertia {} is likely too small (tip masses, a brake \
             rotor, the water in the arms)",
            q(D::Inertia, inertia_kg_m2)
        ),
        Caution::AboveClearance {
            arm,
            peak_m,
            clearance_m,
        } => format!(
            "the jet from arm {} rises to {}, above the stated clearance of {}: lower the \
             elevation or the pressure",
            arm + 1,
            q(D::Length, peak_m),
            q(D::Length, clearance_m)
        ),
    }
}

/// A signed change with `decimals` decimals, "+1.5" or "−0.3" style but in
/// ASCII (`+1.5`, `-0.3`); a change that rounds to zero reads `+0`, never `-0`.
pub fn signed(value: f64, decimals: usize) -> String {
    let scale = 10f64.powi(decimals as i32);
    // Adding +0.0 turns a rounded −0.0 into +0.0.
    let rounded = (value * scale).round() / scale + 0.0;
    format!("{rounded:+.decimals$}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_follow_the_unit_system() {
        let c = Caution::AboveClearance {
            arm: 0,
            peak_m: 3.048,
            clearance_m: 3.0,
        };
        let metric = caution(&c, UnitSystem::Metric);
        let us = caution(&c, UnitSystem::Us);
        assert!(
            metric.contains("arm 1") && metric.contains(" m"),
            "{metric}"
        );
        assert!(us.contains("10") && us.contains("ft"), "{us}");
        let p = Caution::SpinPressure {
            arm: 1,
            nozzle_pa: 840e3,
            inlet_pa: 280e3,
            max_ratio: 1.5,
        };
        assert!(caution(&p, UnitSystem::Us).contains("psi"));
        assert!(caution(&p, UnitSystem::Metric).contains("3.0 times"));
    }

    #[test]
    fn a_change_that_rounds_to_zero_has_no_minus_sign() {
        assert_eq!(signed(-0.3, 0), "+0");
        assert_eq!(signed(-0.04, 1), "+0.0");
        assert_eq!(signed(-0.06, 1), "-0.1");
        assert_eq!(signed(12.34, 1), "+12.3");
    }
}

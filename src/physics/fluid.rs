//! Water and air properties (model.md M11).
//!
//! Water density: Jones & Harris (1992), a quartic in temperature, within
//! 0.006 kg/m³ of IAPWS-95 from 5 to 40 °C. Water viscosity: the Vogel equation
//! μ = 2.414e-5 · 10^(247.8 / (T − 140)) Pa·s with T in kelvin (engineering
//! handbooks), about −1.1 % at 5 °C and within 0.2 % from 15 to 40 °C of IAPWS 2008.
//!
//! Air: pressure from the ISA troposphere at the given altitude, density from
//! the ideal-gas law with R = 287.05 J/(kg·K), viscosity from Sutherland's law
//! (μ₀ = 1.716e-5 Pa·s at 273.15 K, S = 110.4 K).

/// Properties of water at one temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WaterProps {
    /// Density, kg/m³.
    pub density_kg_m3: f64,
    /// Dynamic viscosity, Pa·s.
    pub viscosity_pa_s: f64,
    /// Vapour pressure, Pa (absolute).
    pub vapour_pressure_pa: f64,
}

/// Properties of air at one site.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AirProps {
    /// Density, kg/m³.
    pub density_kg_m3: f64,
    /// Dynamic viscosity, Pa·s.
    pub viscosity_pa_s: f64,
    /// Absolute pressure, Pa.
    pub pressure_pa: f64,
}

/// Sea-level standard atmospheric pressure, Pa.
pub const STANDARD_ATMOSPHERE_PA: f64 = 101_325.0;

/// Specific gas constant of dry air, J/(kg·K).
const R_AIR: f64 = 287.05;

impl WaterProps {
    /// Water at `temperature_c` °C (meant for 0–50 °C).
    pub fn at(temperature_c: f64) -> Self {
        let t = temperature_c;
        // Jones & Harris (1992).
        let density = 999.848_47 + 6.337_563e-2 * t - 8.523_829e-3 * t * t
            + 6.943_248e-5 * t.powi(3)
            - 3.821_216e-7 * t.powi(4);
        // Vogel equation.
        let kelvin = t + 273.15;
        let viscosity = 2.414e-5 * 10f64.powf(247.8 / (kelvin - 140.0));
        // Tetens (1930) saturation vapour pressure over water, Pa.
        let vapour = 610.78 * (17.27 * t / (t + 237.3)).exp();
        WaterProps {
            density_kg_m3: density,
            viscosity_pa_s: viscosity,
            vapour_pressure_pa: vapour,
        }
    }
}

impl AirProps {
    /// Dry air at `temperature_c` °C and `altitude_m` above sea level.
    ///
    /// Pressure follows the ISA troposphere, p = p₀(1 − 2.25577e-5 h)^5.25588.
    pub fn at(temperature_c: f64, altitude_m: f64) -> Self {
        let base = (1.0 - 2.255_77e-5 * altitude_m).max(1e-6);
        let pressure = STANDARD_ATMOSPHERE_PA * base.powf(5.255_88);
        Self::at_pressure(temperature_c, pressure)
    }

    /// Dry air at `temperature_c` °C and absolute pressure `pressure_pa`.
    pub fn at_pressure(temperature_c: f64, pressure_pa: f64) -> Self {
        let kelvin = temperature_c + 273.15;
        let density = pressure_pa / (R_AIR * kelvin);
        let (mu0, t0, s) = (1.716e-5, 273.15, 110.4);
        let viscosity = mu0 * (kelvin / t0).powf(1.5) * (t0 + s) / (kelvin + s);
        AirProps {
            density_kg_m3: density,
            viscosity_pa_s: viscosity,
            pressure_pa,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn water_at_four_degrees_is_densest() {
        let d4 = WaterProps::at(4.0).density_kg_m3;
        assert!(d4 > WaterProps::at(2.0).density_kg_m3);
        assert!(d4 > WaterProps::at(6.0).density_kg_m3);
    }

    #[test]
    fn air_thins_with_altitude() {
        let sea = AirProps::at(15.0, 0.0);
        let high = AirProps::at(15.0, 1500.0);
        assert!((sea.pressure_pa - STANDARD_ATMOSPHERE_PA).abs() < 1e-9);
        // ISA at 1500 m: 84.56 kPa (ISA table, ICAO Doc 7488).
        assert!((high.pressure_pa - 84_556.0).abs() < 50.0);
    }
}

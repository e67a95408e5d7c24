//! Physical quantities: parsing strings with units, dimensions, and display in
//! a report unit system.
//!
//! Inside the crate every quantity is held in coherent SI base units (m, Pa,
//! kg/m³, m/s², rad; temperatures in °C because they only ever select a
//! material property and never enter a product). Conversion happens twice and
//! only at the edges: when a case file is read ([`parse_quantity`]) and when a
//! value is shown ([`UnitSystem::display`]).

use serde::Serialize;
use std::fmt;

/// Exponents of mass, length, time and temperature of a physical dimension.
///
/// Only what pressure-vessel arithmetic needs: pressure is M·L⁻¹·T⁻²,
/// density M·L⁻³, acceleration L·T⁻². Angles are dimensionless.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub struct Dim {
    /// Exponent of mass.
    pub mass: i8,
    /// Exponent of length.
    pub length: i8,
    /// Exponent of time.
    pub time: i8,
    /// Exponent of temperature (only a bare temperature has one).
    pub temperature: i8,
}

impl Dim {
    /// No dimension (ratios, efficiencies, angles).
    pub const NONE: Dim = Dim::new(0, 0, 0, 0);
    /// Length.
    pub const LENGTH: Dim = Dim::new(0, 1, 0, 0);
    /// Area.
    pub const AREA: Dim = Dim::new(0, 2, 0, 0);
    /// Volume.
    pub const VOLUME: Dim = Dim::new(0, 3, 0, 0);
    /// Pressure and stress.
    pub const PRESSURE: Dim = Dim::new(1, -1, -2, 0);
    /// Mass density.
    pub const DENSITY: Dim = Dim::new(1, -3, 0, 0);
    /// Acceleration.
    pub const ACCELERATION: Dim = Dim::new(0, 1, -2, 0);
    /// Mass.
    pub const MASS: Dim = Dim::new(1, 0, 0, 0);
    /// Temperature.
    pub const TEMPERATURE: Dim = Dim::new(0, 0, 0, 1);

    /// A dimension from its exponents.
    pub const fn new(mass: i8, length: i8, time: i8, temperature: i8) -> Dim {
        Dim { mass, length, time, temperature }
    }
    /// Product of two dimensions.
    pub fn mul(self, o: Dim) -> Dim {
        Dim::new(self.mass + o.mass, self.length + o.length, self.time + o.time, self.temperature + o.temperature)
    }
    /// Quotient of two dimensions.
    pub fn div(self, o: Dim) -> Dim {
        Dim::new(self.mass - o.mass, self.length - o.length, self.time - o.time, self.temperature - o.temperature)
    }
    /// Integer power of a dimension.
    pub fn powi(self, n: i8) -> Dim {
        Dim::new(self.mass * n, self.length * n, self.time * n, self.temperature * n)
    }
    /// Integer root of a dimension, when every exponent divides evenly.
    pub fn root(self, n: i8) -> Option<Dim> {
        let all = [self.mass, self.length, self.time, self.temperature];
        if all.iter().all(|e| e % n == 0) {
            Some(Dim::new(self.mass / n, self.length / n, self.time / n, self.temperature / n))
        } else {
            None
        }
    }
}

/// What a quantity is, which decides its dimension and how it is shown.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Kind {
    /// A pure number.
    Dimensionless,
    /// An angle (held in radians, shown in degrees).
    Angle,
    /// A length.
    Length,
    /// An area.
    Area,
    /// A volume.
    Volume,
    /// A pressure (design, test, MAWP).
    Pressure,
    /// A stress (allowable stress); same dimension as pressure.
    Stress,
    /// A mass density.
    Density,
    /// An acceleration (gravity).
    Acceleration,
    /// A mass.
    Mass,
    /// A temperature (held in °C).
    Temperature,
}

impl Kind {
    /// The physical dimension of this kind.
    pub fn dim(self) -> Dim {
        match self {
            Kind::Dimensionless | Kind::Angle => Dim::NONE,
            Kind::Length => Dim::LENGTH,
            Kind::Area => Dim::AREA,
            Kind::Volume => Dim::VOLUME,
            Kind::Pressure | Kind::Stress => Dim::PRESSURE,
            Kind::Density => Dim::DENSITY,
            Kind::Acceleration => Dim::ACCELERATION,
            Kind::Mass => Dim::MASS,
            Kind::Temperature => Dim::TEMPERATURE,
        }
    }
    /// Words for error messages ("a pressure").
    pub fn describe(self) -> &'static str {
        match self {
            Kind::Dimensionless => "a plain number",
            Kind::Angle => "an angle (deg or rad)",
            Kind::Length => "a length (mm, cm, m, in or ft)",
            Kind::Area => "an area (mm2, m2, in2 or ft2)",
            Kind::Volume => "a volume (m3, L, ft3 or in3)",
            Kind::Pressure => "a pressure (Pa, kPa, MPa, bar or psi)",
            Kind::Stress => "a stress (Pa, kPa, MPa, N/mm2, bar, psi or ksi)",
            Kind::Density => "a density (kg/m3, g/cm3 or lb/ft3)",
            Kind::Acceleration => "an acceleration (m/s2 or ft/s2)",
            Kind::Mass => "a mass (kg, t or lb)",
            Kind::Temperature => "a temperature (degC, degF or K)",
        }
    }
    /// The fixed unit used for this kind in the JSON results, with the factor
    /// from the SI base value.
    pub fn json_unit(self) -> (&'static str, fn(f64) -> f64) {
        match self {
            Kind::Dimensionless => ("1", |v| v),
            Kind::Angle => ("deg", f64::to_degrees),
            Kind::Length => ("mm", |v| v * 1e3),
            Kind::Area => ("m2", |v| v),
            Kind::Volume => ("m3", |v| v),
            Kind::Pressure | Kind::Stress => ("MPa", |v| v * 1e-6),
            Kind::Density => ("kg/m3", |v| v),
            Kind::Acceleration => ("m/s2", |v| v),
            Kind::Mass => ("kg", |v| v),
            Kind::Temperature => ("degC", |v| v),
        }
    }
}

/// A value in SI base units together with its kind.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Quantity {
    /// The value in SI base units (°C for temperatures, rad for angles).
    pub value: f64,
    /// What the value is.
    pub kind: Kind,
}

impl Quantity {
    /// A quantity from an SI base value.
    pub fn new(value: f64, kind: Kind) -> Quantity {
        Quantity { value, kind }
    }
    /// A length given in millimetres.
    pub fn mm(v: f64) -> Quantity {
        Quantity::new(v * 1e-3, Kind::Length)
    }
    /// A pressure given in MPa.
    pub fn mpa(v: f64) -> Quantity {
        Quantity::new(v * 1e6, Kind::Pressure)
    }
}

/// Standard acceleration of gravity, m/s² (CGPM 1901 conventional value).
pub const STANDARD_GRAVITY: f64 = 9.80665;
/// One pound-force per square inch in pascal (exact by definition of the inch, pound and g).
pub const PSI: f64 = 6_894.757_293_168_361;
/// One inch in metres (exact).
pub const INCH: f64 = 0.0254;
/// One foot in metres (exact).
pub const FOOT: f64 = 0.3048;
/// One pound (mass) in kilograms (exact).
pub const POUND: f64 = 0.453_592_37;

/// How a unit maps onto the SI base value: `si = value * factor + offset`.
struct UnitDef {
    names: &'static [&'static str],
    kind_dim: Dim,
    factor: f64,
    offset: f64,
}

const UNITS: &[UnitDef] = &[
    // Pressure and stress.
    UnitDef { names: &["Pa"], kind_dim: Dim::PRESSURE, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["kPa"], kind_dim: Dim::PRESSURE, factor: 1e3, offset: 0.0 },
    UnitDef { names: &["MPa", "N/mm2", "N/mm²"], kind_dim: Dim::PRESSURE, factor: 1e6, offset: 0.0 },
    UnitDef { names: &["GPa"], kind_dim: Dim::PRESSURE, factor: 1e9, offset: 0.0 },
    UnitDef { names: &["bar"], kind_dim: Dim::PRESSURE, factor: 1e5, offset: 0.0 },
    UnitDef { names: &["psi"], kind_dim: Dim::PRESSURE, factor: PSI, offset: 0.0 },
    UnitDef { names: &["ksi"], kind_dim: Dim::PRESSURE, factor: PSI * 1e3, offset: 0.0 },
    // Length.
    UnitDef { names: &["mm"], kind_dim: Dim::LENGTH, factor: 1e-3, offset: 0.0 },
    UnitDef { names: &["cm"], kind_dim: Dim::LENGTH, factor: 1e-2, offset: 0.0 },
    UnitDef { names: &["m"], kind_dim: Dim::LENGTH, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["in"], kind_dim: Dim::LENGTH, factor: INCH, offset: 0.0 },
    UnitDef { names: &["ft"], kind_dim: Dim::LENGTH, factor: FOOT, offset: 0.0 },
    // Temperature (held in °C).
    UnitDef { names: &["degC", "°C", "C"], kind_dim: Dim::TEMPERATURE, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["degF", "°F", "F"], kind_dim: Dim::TEMPERATURE, factor: 5.0 / 9.0, offset: -32.0 * 5.0 / 9.0 },
    UnitDef { names: &["K"], kind_dim: Dim::TEMPERATURE, factor: 1.0, offset: -273.15 },
    // Density.
    UnitDef { names: &["kg/m3", "kg/m³"], kind_dim: Dim::DENSITY, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["g/cm3", "g/cm³"], kind_dim: Dim::DENSITY, factor: 1e3, offset: 0.0 },
    UnitDef {
        names: &["lb/ft3", "lb/ft³"], kind_dim: Dim::DENSITY, factor: POUND / (FOOT * FOOT * FOOT), offset: 0.0
    },
    // Angle.
    UnitDef { names: &["deg", "°"], kind_dim: Dim::NONE, factor: std::f64::consts::PI / 180.0, offset: 0.0 },
    UnitDef { names: &["rad"], kind_dim: Dim::NONE, factor: 1.0, offset: 0.0 },
    // Mass.
    UnitDef { names: &["kg"], kind_dim: Dim::MASS, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["t"], kind_dim: Dim::MASS, factor: 1e3, offset: 0.0 },
    UnitDef { names: &["lb"], kind_dim: Dim::MASS, factor: POUND, offset: 0.0 },
    // Area and volume.
    UnitDef { names: &["mm2", "mm²"], kind_dim: Dim::AREA, factor: 1e-6, offset: 0.0 },
    UnitDef { names: &["m2", "m²"], kind_dim: Dim::AREA, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["in2", "in²"], kind_dim: Dim::AREA, factor: INCH * INCH, offset: 0.0 },
    UnitDef { names: &["ft2", "ft²"], kind_dim: Dim::AREA, factor: FOOT * FOOT, offset: 0.0 },
    UnitDef { names: &["m3", "m³"], kind_dim: Dim::VOLUME, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["L"], kind_dim: Dim::VOLUME, factor: 1e-3, offset: 0.0 },
    UnitDef { names: &["ft3", "ft³"], kind_dim: Dim::VOLUME, factor: FOOT * FOOT * FOOT, offset: 0.0 },
    UnitDef { names: &["in3", "in³"], kind_dim: Dim::VOLUME, factor: INCH * INCH * INCH, offset: 0.0 },
    // Acceleration.
    UnitDef { names: &["m/s2", "m/s²"], kind_dim: Dim::ACCELERATION, factor: 1.0, offset: 0.0 },
    UnitDef { names: &["ft/s2", "ft/s²"], kind_dim: Dim::ACCELERATION, factor: FOOT, offset: 0.0 },
];

/// Why a quantity string could not be read.
#[derive(Debug, Clone, PartialEq)]
pub enum QuantityError {
    /// The text does not start with a number.
    NoNumber,
    /// A number was given without a unit for a kind that needs one.
    NoUnit,
    /// The unit is not one we know.
    UnknownUnit(String),
    /// The unit is known but measures something else.
    WrongKind {
        /// The unit that was written.
        unit: String,
    },
    /// The number is NaN or infinite.
    NotFinite,
}

impl fmt::Display for QuantityError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            QuantityError::NoNumber => write!(f, "the value does not start with a number"),
            QuantityError::NoUnit => write!(f, "the value has no unit"),
            QuantityError::UnknownUnit(u) => write!(f, "unknown unit `{u}`"),
            QuantityError::WrongKind { unit } => write!(f, "`{unit}` is not a unit of this kind"),
            QuantityError::NotFinite => write!(f, "the value is not a finite number"),
        }
    }
}

/// Reads a quantity such as `"1.0 MPa"`, `"1800mm"` or `"20 deg"` and checks
/// that it is of the expected kind. Returns the value in SI base units.
pub fn parse_quantity(text: &str, kind: Kind) -> Result<Quantity, QuantityError> {
    let text = text.trim();
    let split = number_prefix_len(text);
    if split == 0 {
        return Err(QuantityError::NoNumber);
    }
    let (num, unit) = text.split_at(split);
    let value: f64 = num.parse().map_err(|_| QuantityError::NoNumber)?;
    if !value.is_finite() {
        return Err(QuantityError::NotFinite);
    }
    let unit = unit.trim();
    if unit.is_empty() {
        if kind == Kind::Dimensionless {
            return Ok(Quantity::new(value, kind));
        }
        return Err(QuantityError::NoUnit);
    }
    let def =
        UNITS.iter().find(|d| d.names.contains(&unit)).ok_or_else(|| QuantityError::UnknownUnit(unit.to_string()))?;
    // Angles and plain numbers share the empty dimension; only angle units are
    // accepted for angles, and a plain number takes no unit at all.
    let wrong = def.kind_dim != kind.dim() || (kind == Kind::Dimensionless && def.kind_dim == Dim::NONE);
    if wrong {
        return Err(QuantityError::WrongKind { unit: unit.to_string() });
    }
    let si = value * def.factor + def.offset;
    if !si.is_finite() {
        return Err(QuantityError::NotFinite);
    }
    Ok(Quantity::new(si, kind))
}

/// Length of the leading decimal number (sign, digits, point, exponent).
fn number_prefix_len(text: &str) -> usize {
    let b = text.as_bytes();
    let mut i = 0;
    if i < b.len() && (b[i] == b'+' || b[i] == b'-') {
        i += 1;
    }
    let mut digits = 0;
    while i < b.len() && (b[i].is_ascii_digit() || b[i] == b'.') {
        digits += usize::from(b[i].is_ascii_digit());
        i += 1;
    }
    if digits == 0 {
        return 0;
    }
    // An exponent only counts when digits follow it, so "2 m" is not "2e".
    if i < b.len() && (b[i] == b'e' || b[i] == b'E') {
        let mut j = i + 1;
        if j < b.len() && (b[j] == b'+' || b[j] == b'-') {
            j += 1;
        }
        let start = j;
        while j < b.len() && b[j].is_ascii_digit() {
            j += 1;
        }
        if j > start {
            i = j;
        }
    }
    i
}

/// The unit system of a report: every shown value is converted to it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum UnitSystem {
    /// mm, MPa, °C, kg, m³.
    #[serde(rename = "SI")]
    Si,
    /// in, psi, °F, lb, ft³.
    #[serde(rename = "US")]
    Us,
}

impl UnitSystem {
    /// The display unit of a kind and the conversion from the SI base value.
    pub fn unit(self, kind: Kind) -> (&'static str, f64, f64) {
        use Kind::*;
        // (symbol, factor, offset): shown = si * factor + offset
        match (self, kind) {
            (_, Dimensionless) => ("", 1.0, 0.0),
            (_, Angle) => ("°", 180.0 / std::f64::consts::PI, 0.0),
            (UnitSystem::Si, Length) => ("mm", 1e3, 0.0),
            (UnitSystem::Si, Area) => ("m²", 1.0, 0.0),
            (UnitSystem::Si, Volume) => ("m³", 1.0, 0.0),
            (UnitSystem::Si, Pressure | Stress) => ("MPa", 1e-6, 0.0),
            (UnitSystem::Si, Density) => ("kg/m³", 1.0, 0.0),
            (UnitSystem::Si, Acceleration) => ("m/s²", 1.0, 0.0),
            (UnitSystem::Si, Mass) => ("kg", 1.0, 0.0),
            (UnitSystem::Si, Temperature) => ("°C", 1.0, 0.0),
            (UnitSystem::Us, Length) => ("in", 1.0 / INCH, 0.0),
            (UnitSystem::Us, Area) => ("ft²", 1.0 / (FOOT * FOOT), 0.0),
            (UnitSystem::Us, Volume) => ("ft³", 1.0 / (FOOT * FOOT * FOOT), 0.0),
            (UnitSystem::Us, Pressure | Stress) => ("psi", 1.0 / PSI, 0.0),
            (UnitSystem::Us, Density) => ("lb/ft³", FOOT * FOOT * FOOT / POUND, 0.0),
            (UnitSystem::Us, Acceleration) => ("ft/s²", 1.0 / FOOT, 0.0),
            (UnitSystem::Us, Mass) => ("lb", 1.0 / POUND, 0.0),
            (UnitSystem::Us, Temperature) => ("°F", 9.0 / 5.0, 32.0),
        }
    }

    /// The SI base value converted to this system's unit for its kind.
    pub fn convert(self, q: Quantity) -> f64 {
        let (_, f, o) = self.unit(q.kind);
        q.value * f + o
    }

    /// The value as text with its unit, for substitutions and tables
    /// (enough significant digits to check by hand).
    pub fn display(self, q: Quantity) -> String {
        let (sym, _, _) = self.unit(q.kind);
        let num = format_number(self.convert(q), 6);
        join_unit(&num, sym)
    }

    /// Like [`display`](Self::display) but rounds up at the shown precision:
    /// used for required thicknesses, which must never be shown thinner than computed.
    pub fn display_up(self, q: Quantity) -> String {
        let (sym, _, _) = self.unit(q.kind);
        join_unit(&format_fixed_up(self.convert(q), self.decimals(q.kind)), sym)
    }

    /// Like [`display`](Self::display) but rounds down at the shown precision:
    /// used for pressure capacities (MAWP, MAP), never shown higher than computed.
    pub fn display_down(self, q: Quantity) -> String {
        let (sym, _, _) = self.unit(q.kind);
        join_unit(&format_fixed_down(self.convert(q), self.decimals(q.kind)), sym)
    }

    /// Decimals shown in tables for a kind: enough to check by hand.
    pub fn decimals(self, kind: Kind) -> usize {
        match (self, kind) {
            (UnitSystem::Si, Kind::Pressure | Kind::Stress) => 4,
            (UnitSystem::Us, Kind::Pressure | Kind::Stress) => 1,
            (_, Kind::Length) => self.thickness_decimals(),
            (_, Kind::Dimensionless) => 4,
            _ => 2,
        }
    }

    /// Decimals used when a thickness is rounded for a table.
    pub fn thickness_decimals(self) -> usize {
        match self {
            UnitSystem::Si => 2,
            UnitSystem::Us => 4,
        }
    }

    /// The name used in case files and reports.
    pub fn name(self) -> &'static str {
        match self {
            UnitSystem::Si => "SI",
            UnitSystem::Us => "US",
        }
    }
}

fn join_unit(num: &str, sym: &str) -> String {
    if sym.is_empty() {
        num.to_string()
    } else if sym == "°" {
        format!("{num}°")
    } else {
        format!("{num} {sym}")
    }
}

/// Formats with `sig` significant digits, trailing zeros trimmed, no exponent
/// for the ranges met in vessel work. Negative zero prints as 0.
pub fn format_number(v: f64, sig: usize) -> String {
    if !v.is_finite() {
        return format!("{v}");
    }
    if v == 0.0 {
        return "0".to_string();
    }
    let mag = v.abs().log10().floor() as i32;
    let decimals = (sig as i32 - 1 - mag).clamp(0, 12) as usize;
    let s = format!("{:.*}", decimals, v);
    trim_zeros(s)
}

fn trim_zeros(s: String) -> String {
    if s.contains('.') {
        let t = s.trim_end_matches('0').trim_end_matches('.');
        if t == "-0" {
            "0".to_string()
        } else {
            t.to_string()
        }
    } else if s == "-0" {
        "0".to_string()
    } else {
        s
    }
}

/// Fixed decimals, rounded towards +infinity (a tiny tolerance absorbs binary
/// noise so that 10.000000000001 shows as 10.00, not 10.01).
pub fn format_fixed_up(v: f64, decimals: usize) -> String {
    let scale = 10f64.powi(decimals as i32);
    let scaled = v * scale;
    let r = if (scaled - scaled.round()).abs() < 1e-7 { scaled.round() } else { scaled.ceil() };
    format!("{:.*}", decimals, r / scale)
}

/// Fixed decimals, rounded towards −infinity, with the same noise tolerance.
pub fn format_fixed_down(v: f64, decimals: usize) -> String {
    let scale = 10f64.powi(decimals as i32);
    let scaled = v * scale;
    let r = if (scaled - scaled.round()).abs() < 1e-7 { scaled.round() } else { scaled.floor() };
    format!("{:.*}", decimals, r / scale)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_pressures_in_every_unit() {
        // Conversion factors: NIST SP 811, Appendix B (psi = 6.894757 kPa; bar = 100 kPa).
        let cases =
            [("1.0 MPa", 1e6), ("1 bar", 1e5), ("100 psi", 689_475.729_316_8), ("250kPa", 2.5e5), ("1 N/mm2", 1e6)];
        for (text, pa) in cases {
            let q = parse_quantity(text, Kind::Pressure).unwrap();
            assert!((q.value - pa).abs() < 1e-6 * pa, "{text}");
        }
    }

    #[test]
    fn parses_lengths_temperatures_densities_angles() {
        assert!((parse_quantity("48 in", Kind::Length).unwrap().value - 1.2192).abs() < 1e-12);
        assert!((parse_quantity("2.4 m", Kind::Length).unwrap().value - 2.4).abs() < 1e-12);
        // 212 °F is the boiling point of water, 100 °C (definition of the Fahrenheit scale).
        assert!((parse_quantity("212 degF", Kind::Temperature).unwrap().value - 100.0).abs() < 1e-9);
        assert!((parse_quantity("150 °C", Kind::Temperature).unwrap().value - 150.0).abs() < 1e-12);
        // 62.428 lb/ft³ is about 1000 kg/m³ (NIST SP 811: 1 lb/ft³ = 16.01846 kg/m³).
        assert!((parse_quantity("62.428 lb/ft3", Kind::Density).unwrap().value - 1000.0).abs() < 0.01);
        assert!((parse_quantity("30 deg", Kind::Angle).unwrap().value - std::f64::consts::PI / 6.0).abs() < 1e-12);
        assert!((parse_quantity("1e-3 m", Kind::Length).unwrap().value - 1e-3).abs() < 1e-15);
    }

    #[test]
    fn rejects_wrong_kind_unknown_unit_and_missing_unit() {
        assert_eq!(parse_quantity("12 mm", Kind::Pressure), Err(QuantityError::WrongKind { unit: "mm".into() }));
        assert_eq!(parse_quantity("12 furlong", Kind::Length), Err(QuantityError::UnknownUnit("furlong".into())));
        assert_eq!(parse_quantity("12", Kind::Length), Err(QuantityError::NoUnit));
        assert_eq!(parse_quantity("MPa", Kind::Pressure), Err(QuantityError::NoNumber));
        assert_eq!(parse_quantity("", Kind::Pressure), Err(QuantityError::NoNumber));
        assert_eq!(parse_quantity("1e999 MPa", Kind::Pressure), Err(QuantityError::NotFinite));
        assert_eq!(parse_quantity("2 rad", Kind::Dimensionless), Err(QuantityError::WrongKind { unit: "rad".into() }));
    }

    #[test]
    fn displays_in_both_systems() {
        let p = Quantity::mpa(1.0);
        assert_eq!(UnitSystem::Si.display(p), "1 MPa");
        assert_eq!(UnitSystem::Us.display(p), "145.038 psi");
        assert_eq!(UnitSystem::Us.display(Quantity::new(100.0, Kind::Temperature)), "212 °F");
        assert_eq!(UnitSystem::Si.display(Quantity::new(std::f64::consts::PI / 6.0, Kind::Angle)), "30°");
    }

    #[test]
    fn thickness_rounds_up_and_pressure_rounds_down() {
        assert_eq!(UnitSystem::Si.display_up(Quantity::mm(9.731)), "9.74 mm");
        assert_eq!(UnitSystem::Si.display_up(Quantity::mm(10.0)), "10.00 mm");
        assert_eq!(UnitSystem::Si.display_down(Quantity::mpa(1.23456)), "1.2345 MPa");
        assert_eq!(format_fixed_up(-0.001, 2), "-0.00");
    }

    #[test]
    fn number_format_trims() {
        assert_eq!(format_number(903.0, 6), "903");
        assert_eq!(format_number(0.85, 6), "0.85");
        assert_eq!(format_number(0.000123456789, 6), "0.000123457");
        assert_eq!(format_number(-0.0, 6), "0");
    }
}

//! ASME BPVC Section VIII Division 1, internal pressure.
//!
//! Each component is evaluated on its own [`Sheet`] in a fixed order:
//! loads, allowances, corroded geometry, required thickness (with the
//! thin/thick-wall switch of Appendix 1, 1-2 where it applies), minimum
//! thickness, adequacy of the nominal thickness, MAWP hot and corroded, MAWP
//! at the vessel top and MAP new and cold. The vessel sheet then takes the
//! lowest MAWP and the test pressures of UG-99 and UG-100.

pub mod cone;
pub mod formulas;
pub mod heads;
pub mod mass;
pub mod selection;
pub mod shells;
pub mod stress;
pub mod vessel;

use crate::calc::{CalcError, Formula, Sheet};
use crate::geometry::{self, component::ComponentGeometry};
use crate::model::{Component, ComponentKind, Design, Diameter};
use crate::rules::{Calculation, ComponentResult, OrderItem, RuleSet};
use crate::units::{Kind, Quantity, UnitSystem, INCH, STANDARD_GRAVITY};
use formulas as f;

/// The editions whose rules this module implements: the paragraph numbering
/// of the 2019 edition onwards (see [`CLAUSE_NOTE`]), with the 1.3 hydrostatic
/// and 1.1 pneumatic test factors of UG-99(b) and UG-100. Earlier editions
/// differ (older test factors, other numbering) and are refused.
pub const EDITIONS: &[&str] = &["2019", "2021", "2023"];

/// The rule set object.
pub struct AsmeViii1;

/// How the clause references are to be read.
pub const CLAUSE_NOTE: &str = "Clause references follow the paragraph numbering of ASME BPVC Section VIII \
Division 1 as arranged in the 2019 to 2023 editions; sub-paragraph letters are cited only where they have been \
stable. Verify every reference against the edition in force for the job.";

impl RuleSet for AsmeViii1 {
    fn id(&self) -> &'static str {
        "asme-viii-1"
    }
    fn title(&self) -> &'static str {
        "ASME BPVC Section VIII Division 1, internal pressure"
    }
    fn editions(&self) -> &'static [&'static str] {
        EDITIONS
    }
    fn formulas(&self) -> &'static [&'static Formula] {
        f::ALL
    }
    fn evaluate(&self, design: &Design) -> Result<Calculation, CalcError> {
        let components =
            design.components.iter().map(|c| evaluate_component(design, c)).collect::<Result<Vec<_>, _>>()?;
        let vessel = vessel::evaluate(design, &components)?;
        Ok(Calculation {
            rule_set: self.id().to_string(),
            rule_set_title: self.title().to_string(),
            edition: design.document.edition.clone(),
            clause_note: CLAUSE_NOTE.to_string(),
            components,
            vessel,
        })
    }
}

/// Which condition a MAWP evaluation is for; only the words differ.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Condition {
    /// Design temperature, corrosion allowance removed.
    HotCorroded,
    /// Test temperature, no corrosion.
    NewCold,
}

impl Condition {
    /// Words appended to step descriptions.
    pub fn words(self) -> &'static str {
        match self {
            Condition::HotCorroded => "hot and corroded",
            Condition::NewCold => "new and cold",
        }
    }
}

/// One minimum thickness of the code, which states it twice: in US
/// customary units and in SI units (which are not exact conversions).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PairedValue {
    /// The US value as the code writes it (`1/16 in`).
    pub us_text: &'static str,
    /// The US value, m.
    pub us: f64,
    /// The SI value as the code writes it (`1.5 mm`).
    pub si_text: &'static str,
    /// The SI value, m.
    pub si: f64,
}

impl PairedValue {
    /// The value for the case's code values, with words saying which was
    /// taken. Without a stated choice the `conservative` one of the two is
    /// taken (the larger for a minimum, the smaller for an allowance), so the
    /// result never depends on the report units.
    pub fn choose(&self, code_values: Option<UnitSystem>, larger_is_conservative: bool) -> (Quantity, String) {
        let (v, words) = match code_values {
            Some(UnitSystem::Si) => (self.si, format!("{}, the SI value (design.code_values = \"SI\")", self.si_text)),
            Some(UnitSystem::Us) => (self.us, format!("{}, the US value (design.code_values = \"US\")", self.us_text)),
            None => {
                let take_us = (self.us > self.si) == larger_is_conservative;
                let (v, text) = if take_us { (self.us, self.us_text) } else { (self.si, self.si_text) };
                (
                    v,
                    format!(
                        "{text}, the more conservative of {} and {} (design.code_values not stated)",
                        self.us_text, self.si_text
                    ),
                )
            }
        };
        (Quantity::new(v, Kind::Length), words)
    }
}

/// UG-16(b): the general minimum thickness of shells and heads, exclusive of
/// corrosion allowance.
pub const UG16_GENERAL: PairedValue =
    PairedValue { us_text: "1/16 in", us: INCH / 16.0, si_text: "1.5 mm", si: 1.5e-3 };

/// UG-16(b)(4): shells and heads in compressed air, steam and water service
/// made of the carbon and low-alloy steels of Part UCS (from memory of the
/// paragraph: 3/32 in, 2.5 mm, exclusive of corrosion allowance).
pub const UG16_AIR_STEAM_WATER: PairedValue =
    PairedValue { us_text: "3/32 in", us: 3.0 * INCH / 32.0, si_text: "2.5 mm", si: 2.5e-3 };

/// Records the UG-16(b) minimum thickness `t_f` of a part of `material`.
pub fn ug16_floor(s: &mut Sheet, design: &Design, material: &crate::model::Material) -> Quantity {
    let service = design.conditions.service;
    let part = material.part.as_deref();
    // A material whose part is not stated may be a carbon steel: in air,
    // steam or water service the higher floor is then taken.
    let (paired, clause, why) = if service.is_air_steam_or_water() && part.is_none_or(|p| p == "UCS") {
        let why = match part {
            Some(_) => format!("{} service, Part UCS material", service.name()),
            None => format!("{} service, material part not stated (taken as Part UCS)", service.name()),
        };
        (UG16_AIR_STEAM_WATER, "UG-16(b)(4)", why)
    } else {
        let why = match (service, part) {
            (crate::model::Service::NotStated, _) => {
                "service not stated (design.service); UG-16(b)(4) asks for more in compressed air, steam or water \
                 service with Part UCS materials"
                    .to_string()
            }
            (sv, Some(p)) if sv.is_air_steam_or_water() => format!("{} service, Part {p} material", sv.name()),
            (sv, _) => format!("{} service", sv.name()),
        };
        (UG16_GENERAL, "UG-16(b)", why)
    };
    let (q, words) = paired.choose(design.conditions.code_values, true);
    s.record(
        "t_f",
        &format!("minimum thickness exclusive of corrosion allowance: {why}"),
        clause,
        &format!("tf = {words}"),
        q,
    )
}

fn len(v: f64) -> Quantity {
    Quantity::new(v, Kind::Length)
}

/// Binds the corroded (or new) inside or outside dimensions of a component.
pub fn bind_diameter(s: &mut Sheet, c: &Component, condition: Condition) -> Result<(), CalcError> {
    match c.diameter {
        Diameter::Inside(d) => {
            s.input("D_n", "inside diameter, as given", d);
            s.step(&f::CORRODED_DIAMETER, &format!("inside diameter, {}", condition.words()))?;
            s.step(&f::INSIDE_RADIUS, &format!("inside radius, {}", condition.words()))?;
        }
        Diameter::Outside(d) => {
            // The outside does not corrode: the allowance is taken off the thickness.
            s.input("D_o", "outside diameter", d);
            s.step(&f::OUTSIDE_RADIUS, "outside radius")?;
        }
    }
    Ok(())
}

/// The first half of a component's sheet: loads, allowances, corroded
/// geometry, required and minimum thickness. The component evaluation and the
/// head study both start here, so a head is sized by one piece of code.
pub struct PressureThickness<'a> {
    /// The sheet so far.
    pub sheet: Sheet,
    /// Limits of applicability stated in words.
    pub limits: Vec<String>,
    /// The component's material.
    pub material: &'a crate::model::Material,
    /// Design pressure at the component.
    pub pressure: Quantity,
    /// Static head at the component.
    pub static_head: Quantity,
    /// Required thickness for pressure (`None` when the rules do not apply).
    pub required: Option<Quantity>,
    /// Minimum thickness with floor and allowances (`None` likewise).
    pub minimum: Option<Quantity>,
}

/// Records loads, allowances, corroded geometry and the required and minimum
/// thickness of `c` on a new sheet.
pub fn pressure_thickness<'a>(design: &'a Design, c: &Component) -> Result<PressureThickness<'a>, CalcError> {
    let u = design.units;
    let mut s = Sheet::new(&c.id, u);
    let material = design.material(c).ok_or_else(|| CalcError::OutOfRange {
        component: c.id.clone(),
        message: format!("material `{}` is not defined", c.material),
    })?;
    let mut limits = Vec::new();
    // Loads.
    s.input("P_d", "design pressure at the vessel top", design.conditions.pressure);
    let static_head = match (design.conditions.liquid_density, c.liquid_head.value > 0.0) {
        (Some(rho), true) => {
            s.input("rho", "liquid density", rho);
            s.input("g", "standard gravity", Quantity::new(STANDARD_GRAVITY, Kind::Acceleration));
            s.input("h", "liquid head at the component's lowest point", c.liquid_head);
            s.step(&f::STATIC_HEAD, "static head of the liquid")?
        }
        _ => s.input("P_s", "static head (no liquid head given)", Quantity::new(0.0, Kind::Pressure)),
    };
    let p = s.step(&f::PRESSURE_AT_COMPONENT, "design pressure at the component")?;

    // Material, joint and allowances.
    stress::allowable(&mut s, material, Condition::HotCorroded, "S")?;
    let e = Quantity::new(c.joint_efficiency, Kind::Dimensionless);
    match &c.joint {
        None => {
            s.input("E", "joint efficiency", e);
        }
        Some(j) => {
            s.record(
                "E",
                &format!("joint efficiency looked up for {}", j.words()),
                &j.clause(),
                &format!(
                    "E = {} (Table UW-12 as held by Knuckle, from memory of the code)",
                    crate::expr::show_number(c.joint_efficiency)
                ),
                e,
            );
            if let Some(limit) = j.limitation() {
                limits.push(format!("{}: {limit} Knuckle does not check this.", c.id));
            }
        }
    }
    if matches!(c.kind, ComponentKind::Cylinder) {
        s.input(
            "E_c",
            "joint efficiency of circumferential joints",
            Quantity::new(c.circumferential_joint_efficiency, Kind::Dimensionless),
        );
    }
    s.input("c", "corrosion allowance", c.corrosion_allowance);
    let thinning_words = if c.kind.is_formed_head() {
        "thinning allowance for forming"
    } else {
        "thinning allowance (none: not a formed head)"
    };
    s.input("t_th", thinning_words, c.thinning_allowance);
    ug16_floor(&mut s, design, material);

    // Corroded geometry and required thickness.
    bind_diameter(&mut s, c, Condition::HotCorroded)?;
    let required = match &c.kind {
        ComponentKind::Cylinder => Some(shells::cylinder_thickness(&mut s, c)?),
        ComponentKind::Sphere | ComponentKind::HemisphericalHead => Some(shells::sphere_thickness(&mut s, c)?),
        ComponentKind::EllipsoidalHead { aspect_ratio } => {
            Some(heads::ellipsoidal_thickness(&mut s, c, *aspect_ratio, Condition::HotCorroded)?)
        }
        ComponentKind::TorisphericalHead { crown_radius, knuckle_radius, .. } => {
            Some(heads::torispherical_thickness(&mut s, *crown_radius, *knuckle_radius, Condition::HotCorroded)?)
        }
        ComponentKind::ConicalSection { half_apex_angle, .. } => {
            cone::thickness(&mut s, c, *half_apex_angle, &mut limits)?
        }
    };
    let Some(required) = required else {
        return Ok(PressureThickness {
            sheet: s,
            limits,
            material,
            pressure: p,
            static_head,
            required: None,
            minimum: None,
        });
    };
    if required.value <= 0.0 {
        return Err(CalcError::OutOfRange {
            component: c.id.clone(),
            message: "the required thickness is not positive".into(),
        });
    }
    s.bind("t_r", required);
    let minimum = s.step(
        &f::MINIMUM_THICKNESS,
        "minimum thickness: the larger of the pressure thickness and the floor, plus corrosion and thinning allowances",
    )?;
    Ok(PressureThickness {
        sheet: s,
        limits,
        material,
        pressure: p,
        static_head,
        required: Some(required),
        minimum: Some(minimum),
    })
}

/// Evaluates one component.
pub fn evaluate_component(design: &Design, c: &Component) -> Result<ComponentResult, CalcError> {
    let u = design.units;
    let PressureThickness { sheet: mut s, limits, material, pressure: p, static_head, required, minimum } =
        pressure_thickness(design, c)?;
    let (Some(required), Some(minimum)) = (required, minimum) else {
        // The rules do not apply (for example a cone steeper than 30°): no
        // thickness or pressure is reported, and the failed applicability
        // check already on the sheet says which rules are needed.
        return Ok(finish(c, s, None, None, p, static_head, None, None, None, limits));
    };

    // Nominal thickness (given, or selected from the commercial list) and its adequacy.
    let chosen = selection::nominal(&mut s, design, c, minimum)?;
    let nominal = chosen.thickness;
    if let Diameter::Outside(d) = c.diameter {
        if 2.0 * nominal.value >= d.value {
            return Err(CalcError::OutOfRange {
                component: c.id.clone(),
                message: format!(
                    "the thickness {} is too large for the formulas: it reaches the outside radius {}",
                    u.display(nominal),
                    u.display(Quantity::new(d.value / 2.0, Kind::Length))
                ),
            });
        }
    }

    // MAWP hot and corroded, after the shape limits that use the same thickness.
    let available = if chosen.deducts { &f::AVAILABLE_THICKNESS_MILL } else { &f::AVAILABLE_THICKNESS };
    s.step(available, "thickness available, hot and corroded")?;
    heads::shape_limits(&mut s, c, nominal)?;
    let mawp = component_mawp(&mut s, c, Condition::HotCorroded)?;
    s.check_at_least(
        "MAWP at the component covers the design pressure there",
        "UG-98",
        p,
        mawp,
        "the component cannot carry the design pressure plus static head",
    );
    let top = s.step(&f::MAWP_TOP, "MAWP referred to the vessel top")?;

    // MAP new and cold: no corrosion allowance, allowable stress at test temperature.
    s.input("c", "corrosion allowance, new condition", len(0.0));
    stress::allowable(&mut s, material, Condition::NewCold, "S")?;
    bind_diameter(&mut s, c, Condition::NewCold)?;
    let new = if chosen.deducts { &f::NEW_THICKNESS_MILL } else { &f::NEW_THICKNESS };
    s.step(new, "thickness available, new and cold")?;
    let map = component_mawp(&mut s, c, Condition::NewCold)?;

    // Mass, volume and what to order, at the nominal thickness.
    // `t_n` is still bound to the nominal (or selected) thickness.
    let geometry = head_geometry(&mut s, c, nominal, material.density)?;
    let mv = if c.kind.is_formed_head() {
        // The head's metal and inside volumes come from its exact geometry.
        let volumes = geometry.as_ref().map(|g| mass::HeadVolumes {
            metal: Quantity::new(g.properties.metal_volume.value * 1e-9, Kind::Volume),
            inside: Quantity::new(g.properties.volume_with_flange.value * 1e-9, Kind::Volume),
        });
        mass::head(&mut s, material, volumes)?
    } else {
        mass::shell(&mut s, c, material)?
    };
    let mut order = order_item(c, material, nominal, chosen.selected.as_ref(), mv);
    if c.kind.is_formed_head() {
        order.blank_diameter = geometry.as_ref().map(|g| len(g.properties.blank_diameter.value * 1e-3));
    }

    let mut result =
        finish(c, s, Some(required), Some(minimum), p, static_head, Some(mawp), Some(top), Some(map), limits);
    result.selected_thickness = chosen.selected.map(|k| k.thickness);
    result.mass = mv.mass;
    result.volume = mv.volume;
    result.order = Some(order);
    result.geometry = geometry;
    Ok(result)
}

/// Geometry of formed heads and cones at the nominal (or selected) thickness,
/// with the UG-81 check of a 2:1-equivalent torisphere against the true 2:1
/// ellipse it stands in for.
fn head_geometry(
    s: &mut Sheet,
    c: &Component,
    thickness: Quantity,
    density: Quantity,
) -> Result<Option<ComponentGeometry>, CalcError> {
    let basis = if c.nominal_thickness.is_some() { "nominal thickness" } else { "selected thickness" };
    let g = geometry::component::for_component(c, thickness.value * 1e3, density.value, basis)
        .map_err(|e| CalcError::OutOfRange { component: c.id.clone(), message: format!("head geometry: {e}") })?;
    let Some(g) = g else { return Ok(None) };
    if let Some(dev) = g.shape_deviation.as_ref().filter(|d| d.judged) {
        s.input("D_i", "inside diameter of the head, new", len(g.spec.inside_diameter * 1e-3));
        let out_limit = s.step(&f::UG81_OUTSIDE, "largest deviation allowed outside the specified shape")?;
        let in_limit = s.step(&f::UG81_INSIDE, "largest deviation allowed inside the specified shape")?;
        let d_out = s.input(
            "Delta_o",
            "largest deviation outside the true 2:1 ellipse (normal distance, numerical search to 1e-10 mm)",
            len(dev.deviation.max_outside * 1e-3),
        );
        let d_in = s.input(
            "Delta_i",
            "largest deviation inside the true 2:1 ellipse (normal distance, numerical search to 1e-10 mm)",
            len(dev.deviation.max_inside * 1e-3),
        );
        let note = "the 2:1-equivalent torisphere departs from the 2:1 ellipse it stands in for by more than the \
                    forming tolerance";
        s.check_at_most(
            "deviation outside the 2:1 ellipse within the UG-81 tolerance",
            "UG-81",
            out_limit,
            d_out,
            note,
            false,
        );
        s.check_at_most(
            "deviation inside the 2:1 ellipse within the UG-81 tolerance",
            "UG-81",
            in_limit,
            d_in,
            note,
            false,
        );
    }
    Ok(Some(g))
}

/// The order-list line of a component: what to buy and, for a rolled
/// cylinder, the blank (width = length, length = developed length).
fn order_item(
    c: &Component,
    material: &crate::model::Material,
    nominal: Quantity,
    selected: Option<&crate::stock::Candidate>,
    mv: mass::MassVolume,
) -> OrderItem {
    let pipe = c.pipe_size.as_ref().filter(|_| c.is_pipe());
    let ordered_as = match (selected, pipe) {
        (Some(k), _) => k.label.clone(),
        (None, Some(p)) => format!("NPS {} pipe, wall as given", p.nps),
        (None, None) => format!("{} as given", c.product_form.name()),
    };
    let cylinder = matches!(c.kind, ComponentKind::Cylinder);
    let (width, length) = match (cylinder, c.is_pipe()) {
        (true, false) => (c.length.filter(|_| mv.developed_length.is_some()), mv.developed_length),
        (true, true) => (None, c.length),
        _ => (None, None),
    };
    OrderItem {
        component: c.id.clone(),
        material: material.name.clone(),
        product_form: c.product_form.name().to_string(),
        thickness: nominal,
        ordered_as,
        blank_width: width,
        blank_length: length,
        blank_diameter: None,
    }
}

/// The MAWP of a component for the thickness bound to `t`.
fn component_mawp(s: &mut Sheet, c: &Component, condition: Condition) -> Result<Quantity, CalcError> {
    let q = match &c.kind {
        ComponentKind::Cylinder => shells::cylinder_mawp(s, c, condition)?,
        ComponentKind::Sphere | ComponentKind::HemisphericalHead => shells::sphere_mawp(s, c, condition)?,
        ComponentKind::EllipsoidalHead { .. } => heads::ellipsoidal_mawp(s, c, condition)?,
        ComponentKind::TorisphericalHead { crown_radius, knuckle_radius, .. } => {
            heads::torispherical_mawp(s, *crown_radius, *knuckle_radius, condition)?
        }
        ComponentKind::ConicalSection { .. } => cone::mawp(s, c, condition)?,
    };
    // NaN must fail too, so the test is written to be true for it.
    if q.value.is_nan() || q.value <= 0.0 {
        // With a positive thickness every inside-diameter form gives a
        // positive MAWP; only an outside-diameter form whose denominator
        // has gone negative (a wall near the outside radius) does not.
        let why = match s.get("t") {
            Some(t) if t.value > 0.0 => {
                "the thickness is too large for the formulas (it approaches the outside radius)"
            }
            _ => "the thickness available is not positive, so it is too small for the formulas",
        };
        return Err(CalcError::OutOfRange {
            component: c.id.clone(),
            message: format!("the MAWP {} is not positive; {why}", condition.words()),
        });
    }
    Ok(q)
}

#[allow(clippy::too_many_arguments)]
fn finish(
    c: &Component,
    s: Sheet,
    required: Option<Quantity>,
    minimum: Option<Quantity>,
    p: Quantity,
    static_head: Quantity,
    mawp: Option<Quantity>,
    top: Option<Quantity>,
    map: Option<Quantity>,
    limits: Vec<String>,
) -> ComponentResult {
    let acceptable = s.checks.iter().all(|k| k.pass);
    ComponentResult {
        id: c.id.clone(),
        type_name: c.kind.type_name().to_string(),
        description: describe(c),
        steps: s.steps,
        checks: s.checks,
        required_thickness: required,
        minimum_thickness: minimum,
        nominal_thickness: c.nominal_thickness,
        design_pressure: p,
        static_head,
        mawp,
        mawp_top: top,
        map,
        limits,
        acceptable,
        selected_thickness: None,
        mass: None,
        volume: None,
        order: None,
        geometry: None,
    }
}

/// A short description of the component's geometry.
pub fn describe(c: &Component) -> String {
    match &c.kind {
        ComponentKind::Cylinder => "cylindrical shell".to_string(),
        ComponentKind::Sphere => "spherical shell".to_string(),
        ComponentKind::HemisphericalHead => "hemispherical head".to_string(),
        ComponentKind::EllipsoidalHead { aspect_ratio } => {
            format!("ellipsoidal head, D/2h = {}", crate::expr::show_number(*aspect_ratio))
        }
        ComponentKind::TorisphericalHead { shape: Some(shape), .. } => {
            format!("torispherical head, {} shape", shape.name())
        }
        ComponentKind::TorisphericalHead { .. } => "torispherical head".to_string(),
        ComponentKind::ConicalSection { half_apex_angle, .. } => {
            format!("conical section, half-apex angle {}", UnitSystem::Si.display(*half_apex_angle))
        }
    }
}

//! Empty mass, inside volume and blank size of shells and cones, new and at
//! the nominal (or selected) thickness bound as `t_n`.
//!
//! The shell mass is exact for the solid between two surfaces: for a
//! cylinder π·D_m·t·L equals π·(D_o² − D_i²)·L/4, and for a cone cut square
//! to its axis the metal volume is π·t·(slant length)·(mean diameter of the
//! mid-surface). Formed heads take their volumes from the head geometry
//! module through [`head`].

use super::formulas as f;
use crate::calc::{CalcError, Sheet};
use crate::model::{Component, ComponentKind, Diameter, Material};
use crate::units::{Kind, Quantity};

/// Mass, volume and the developed length of a rolled plate, where known.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct MassVolume {
    /// Empty mass.
    pub mass: Option<Quantity>,
    /// Inside volume.
    pub volume: Option<Quantity>,
    /// Developed length of the plate a cylinder is rolled from (mean diameter).
    pub developed_length: Option<Quantity>,
}

/// Volumes of a formed head computed by the head geometry module.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HeadVolumes {
    /// Volume of the metal of the head (including its straight flange).
    pub metal: Quantity,
    /// Inside volume of the head (including its straight flange).
    pub inside: Quantity,
}

fn density(s: &mut Sheet, m: &Material) {
    s.input("rho_m", &format!("density of {}", m.name), m.density);
    s.bind("pi", Quantity::new(std::f64::consts::PI, Kind::Dimensionless));
}

/// Records the mass and volume of a cylinder, sphere or cone. Formed heads
/// and cylinders without a length give nothing here.
pub fn shell(s: &mut Sheet, c: &Component, m: &Material) -> Result<MassVolume, CalcError> {
    match &c.kind {
        ComponentKind::Cylinder => {
            let Some(length) = c.length else {
                return Ok(MassVolume::default());
            };
            density(s, m);
            match c.diameter {
                Diameter::Inside(d) => {
                    s.bind("D_i", d);
                    s.step(&f::MEAN_DIAMETER_IN, "mean diameter, new")?;
                }
                Diameter::Outside(_) => {
                    s.step(&f::MEAN_DIAMETER_OUT, "mean diameter, new")?;
                    s.step(&f::NEW_INSIDE_DIAMETER, "inside diameter, new")?;
                }
            }
            s.input("L_s", "length of the cylinder", length);
            let mass = s.step(&f::CYL_MASS, "empty mass of the cylinder")?;
            let volume = s.step(&f::CYL_VOLUME, "inside volume of the cylinder")?;
            let developed = if c.is_pipe() {
                None
            } else {
                Some(s.step(&f::DEVELOPED_LENGTH, "developed length of the rolled plate, on the mean diameter")?)
            };
            Ok(MassVolume { mass: Some(mass), volume: Some(volume), developed_length: developed })
        }
        ComponentKind::Sphere => {
            density(s, m);
            match c.diameter {
                Diameter::Inside(d) => s.bind("D_i", d),
                Diameter::Outside(_) => {
                    s.step(&f::NEW_INSIDE_DIAMETER, "inside diameter, new")?;
                }
            }
            let mass = s.step(&f::SPH_MASS, "empty mass of the sphere")?;
            let volume = s.step(&f::SPH_VOLUME, "inside volume of the sphere")?;
            Ok(MassVolume { mass: Some(mass), volume: Some(volume), developed_length: None })
        }
        ComponentKind::ConicalSection { small_diameter, half_apex_angle } => {
            density(s, m);
            s.bind("alpha", *half_apex_angle);
            match c.diameter {
                Diameter::Inside(d) => {
                    s.bind("D_i", d);
                    s.input("D_2i", "inside diameter at the small end", *small_diameter);
                }
                Diameter::Outside(_) => {
                    s.input("D_2o", "outside diameter at the small end", *small_diameter);
                    s.step(&f::CONE_NEW_INSIDE, "inside diameter at the large end, new")?;
                    s.step(&f::CONE_NEW_INSIDE_SMALL, "inside diameter at the small end, new")?;
                }
            }
            s.step(&f::CONE_AXIAL_LENGTH, "axial length of the cone")?;
            let mass = s.step(&f::CONE_MASS, "empty mass of the cone")?;
            let volume = s.step(&f::CONE_VOLUME, "inside volume of the cone")?;
            Ok(MassVolume { mass: Some(mass), volume: Some(volume), developed_length: None })
        }
        ComponentKind::HemisphericalHead
        | ComponentKind::EllipsoidalHead { .. }
        | ComponentKind::TorisphericalHead { .. } => Ok(MassVolume::default()),
    }
}

/// Records the mass and volume of a formed head from volumes computed by
/// the head geometry module; with `None` nothing is known and nothing is
/// recorded.
pub fn head(s: &mut Sheet, m: &Material, volumes: Option<HeadVolumes>) -> Result<MassVolume, CalcError> {
    let Some(v) = volumes else {
        return Ok(MassVolume::default());
    };
    s.input("rho_m", &format!("density of {}", m.name), m.density);
    s.input("V_m", "metal volume of the head, from the head geometry", v.metal);
    let mass = s.step(&f::HEAD_MASS, "empty mass of the head")?;
    let volume = s.input("V", "inside volume of the head, from the head geometry", v.inside);
    Ok(MassVolume { mass: Some(mass), volume: Some(volume), developed_length: None })
}

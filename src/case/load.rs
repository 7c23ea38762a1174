//! Reading a case: file, `--set` overrides, YAML parsing, validation into SI.
//!
//! Validation collects every problem it finds instead of stopping at the first, and each problem
//! names the file, the line (where known), the field path and the fix.

use super::defaults::{self, Def};
use super::model::*;
use super::raw::*;
use crate::units::{self, Kind};
use std::fmt;
use std::path::{Path, PathBuf};

/// One thing wrong with a case.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    /// Field path, e.g. `profiles[2].values[7]`.
    pub field: String,
    /// 1-based line in the case file, where known.
    pub line: Option<u64>,
    /// What is wrong and how to fix it.
    pub message: String,
}

/// Why a case could not be loaded.
#[derive(Debug, Clone, PartialEq)]
pub enum CaseError {
    /// The file could not be read.
    Read { file: String, message: String },
    /// The YAML is malformed, or a field is missing, misspelt or of the wrong type.
    Syntax { file: String, message: String },
    /// Fields parsed but their values are not acceptable.
    Invalid {
        file: String,
        problems: Vec<Problem>,
    },
    /// A `--set path=value` argument could not be applied.
    Set { arg: String, message: String },
}

impl fmt::Display for CaseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            CaseError::Read { file, message } => write!(
                f,
                "{file}: cannot read the case file: {message}. Fix: check the path."
            ),
            CaseError::Syntax { file, message } => {
                let m = message.trim_end();
                write!(f, "{file}: {}", m.strip_prefix("error: ").unwrap_or(m))?;
                if message.contains("unknown field") {
                    write!(f, "\nFix: check the spelling; `rollsleuth template` prints every field.")?;
                } else if message.contains("missing field") {
                    write!(f, "\nFix: add the field; `rollsleuth template` shows an example.")?;
                }
                Ok(())
            }
            CaseError::Invalid { file, problems } => {
                let n = problems.len();
                write!(f, "{file}: {n} problem{} in the case", if n == 1 { "" } else { "s" })?;
                for p in problems {
                    match p.line {
                        Some(l) => write!(f, "\n  {file}:{l}: {}: {}", p.field, p.message)?,
                        None => write!(f, "\n  {file}: {}: {}", p.field, p.message)?,
                    }
                }
                Ok(())
            }
            CaseError::Set { arg, message } => write!(
                f,
                "--set {arg}: {message}. Fix: write --set path=value, e.g. --set winding.tension=\"2.0 pli\"."
            ),
        }
    }
}

impl std::error::Error for CaseError {}

/// The demo case embedded in the binary.
pub const DEMO_YAML: &str = include_str!("../../field_cases/nordvik_pm3_caliper_band.yaml");
/// Name under which the demo case is reported.
pub const DEMO_NAME: &str = "<demo: field_cases/nordvik_pm3_caliper_band.yaml>";

/// Load the embedded demo case.
pub fn load_demo(sets: &[String]) -> Result<Case, CaseError> {
    load_str(DEMO_YAML, DEMO_NAME, None, sets)
}

/// Load and validate a case file, applying `--set path=value` overrides first.
pub fn load_file(path: &Path, sets: &[String]) -> Result<Case, CaseError> {
    let file = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|e| CaseError::Read {
        file: file.clone(),
        message: e.to_string(),
    })?;
    load_str(&text, &file, path.parent(), sets)
}

/// Load and validate a case from text. `base` resolves relative CSV paths.
pub fn load_str(
    text: &str,
    file: &str,
    base: Option<&Path>,
    sets: &[String],
) -> Result<Case, CaseError> {
    let (raw, lines_known): (RawCase, bool) = if sets.is_empty() {
        (parse_yaml(text, file)?, true)
    } else {
        let mut tree: serde_json::Value =
            serde_saphyr::from_str(text).map_err(|e| CaseError::Syntax {
                file: file.to_string(),
                message: e.to_string(),
            })?;
        for s in sets {
            apply_set(&mut tree, s)?;
        }
        // JSON is YAML: re-read the edited tree with the typed schema.
        let json = serde_json::to_string(&tree).map_err(|e| CaseError::Set {
            arg: sets.join(" "),
            message: e.to_string(),
        })?;
        let label = format!("{file} (with --set)");
        (parse_yaml(&json, &label)?, false)
    };
    let mut v = Validator {
        lines_known,
        base: base.map(Path::to_path_buf),
        problems: Vec::new(),
        defaults: Vec::new(),
        warnings: Vec::new(),
    };
    let case = v.case(raw, file);
    match case {
        Some(c) if v.problems.is_empty() => Ok(c),
        _ => Err(CaseError::Invalid {
            file: file.to_string(),
            problems: v.problems,
        }),
    }
}

fn parse_yaml(text: &str, file: &str) -> Result<RawCase, CaseError> {
    serde_saphyr::from_str(text).map_err(|e| CaseError::Syntax {
        file: file.to_string(),
        message: e.to_string(),
    })
}

/// Apply one `path=value` override to a YAML tree. Missing maps on the path are created;
/// list indices are written `name[3]`.
pub fn apply_set(tree: &mut serde_json::Value, arg: &str) -> Result<(), CaseError> {
    let err = |m: &str| CaseError::Set {
        arg: arg.to_string(),
        message: m.to_string(),
    };
    let (path, value) = arg
        .split_once('=')
        .ok_or_else(|| err("no '=' between the field path and the value"))?;
    let path = path.trim();
    if path.is_empty() {
        return Err(err("empty field path"));
    }
    let parsed: serde_json::Value = serde_saphyr::from_str(value.trim())
        .unwrap_or_else(|_| serde_json::Value::String(value.trim().to_string()));
    let mut node = tree;
    let segs: Vec<&str> = path.split('.').collect();
    for (si, seg) in segs.iter().enumerate() {
        let (name, idx) = match seg.find('[') {
            Some(b) => {
                let close = seg
                    .rfind(']')
                    .filter(|&c| c > b)
                    .ok_or_else(|| err("unclosed '[' in the field path"))?;
                let i: usize = seg[b + 1..close]
                    .parse()
                    .map_err(|_| err("list index must be a whole number"))?;
                (&seg[..b], Some(i))
            }
            None => (*seg, None),
        };
        if name.is_empty() {
            return Err(err("empty name in the field path"));
        }
        let last = si + 1 == segs.len();
        let obj = node
            .as_object_mut()
            .ok_or_else(|| err(&format!("'{name}' is inside a value that is not a map")))?;
        if last && idx.is_none() {
            obj.insert(name.to_string(), parsed);
            return Ok(());
        }
        let child = obj
            .entry(name.to_string())
            .or_insert_with(|| serde_json::Value::Object(Default::default()));
        node = match idx {
            Some(i) => {
                let arr = child
                    .as_array_mut()
                    .ok_or_else(|| err(&format!("'{name}' is not a list")))?;
                let len = arr.len();
                let slot = arr.get_mut(i).ok_or_else(|| {
                    err(&format!(
                        "'{name}' has {len} entries, index {i} is past the end"
                    ))
                })?;
                if last {
                    *slot = parsed;
                    return Ok(());
                }
                slot
            }
            None => child,
        };
    }
    Ok(())
}

/// Numbers with the line they came from.
type Points = Vec<(f64, Option<u64>)>;

struct Validator {
    lines_known: bool,
    base: Option<PathBuf>,
    problems: Vec<Problem>,
    defaults: Vec<DefaultUsed>,
    warnings: Vec<String>,
}

fn line_of<T>(s: &serde_saphyr::Spanned<T>) -> u64 {
    s.referenced.line()
}

impl Validator {
    fn push(&mut self, field: &str, line: Option<u64>, message: String) {
        let line = if self.lines_known {
            line.filter(|&l| l > 0)
        } else {
            None
        };
        self.problems.push(Problem {
            field: field.to_string(),
            line,
            message,
        });
    }

    /// Parse a quantity; `range` is (min, max, inclusive-min) in SI.
    fn q(&mut self, q: &Q, field: &str, kind: Kind, range: Range) -> Option<f64> {
        match units::parse(&q.value.0, kind) {
            Ok(v) => self.check_range(v, field, Some(line_of(q)), kind, range),
            Err(e) => {
                self.push(field, Some(line_of(q)), format!("{e}"));
                None
            }
        }
    }

    fn check_range(
        &mut self,
        v: f64,
        field: &str,
        line: Option<u64>,
        kind: Kind,
        range: Range,
    ) -> Option<f64> {
        let (lo, hi, what) = range.bounds();
        if !v.is_finite() {
            self.push(
                field,
                line,
                "is not a finite number; give a real value".into(),
            );
            return None;
        }
        let below = if range.open_low() { v <= lo } else { v < lo };
        if below || v > hi {
            let d = units::display(kind, units::System::Si, false);
            let show = |x: f64| {
                if x.is_finite() {
                    units::sig(d.from_si(x), 4)
                } else {
                    "no limit".into()
                }
            };
            self.push(
                field,
                line,
                format!(
                    "value {} {} is out of range: it must be {what} ({} .. {} {})",
                    units::sig(d.from_si(v), 4),
                    d.label,
                    show(lo),
                    show(hi),
                    d.label
                ),
            );
            return None;
        }
        Some(v)
    }

    /// A quantity that may be missing: then the default is used and recorded.
    fn or_default(
        &mut self,
        q: Option<&Q>,
        field: &str,
        kind: Kind,
        range: Range,
        def: Option<Def>,
    ) -> Option<f64> {
        if let Some(q) = q {
            return self.q(q, field, kind, range);
        }
        let Some(def) = def else {
            self.push(
                field,
                None,
                format!(
                    "is required for grade 'custom' (no default); add e.g. {}",
                    kind.example()
                ),
            );
            return None;
        };
        self.defaults.push(DefaultUsed {
            field: field.to_string(),
            value: def.text.to_string(),
            source: def.source.to_string(),
        });
        match units::parse(def.text, kind) {
            Ok(v) => Some(v),
            Err(e) => {
                self.push(
                    field,
                    None,
                    format!("internal default '{}' is bad: {e}", def.text),
                );
                None
            }
        }
    }

    fn word<'a>(
        &mut self,
        s: &'a serde_saphyr::Spanned<String>,
        field: &str,
        allowed: &[&'a str],
    ) -> Option<&'a str> {
        let v = s.value.as_str();
        if allowed.contains(&v) {
            Some(v)
        } else {
            self.push(
                field,
                Some(line_of(s)),
                format!("'{v}' is not one of: {}", allowed.join(", ")),
            );
            None
        }
    }

    fn case(&mut self, raw: RawCase, file: &str) -> Option<Case> {
        if raw.format.value != 1 {
            self.push(
                "format",
                Some(line_of(&raw.format)),
                format!(
                    "format {} is not supported; this version reads `format: 1`",
                    raw.format.value
                ),
            );
        }
        let complaint = raw.complaint.as_ref().and_then(|c| {
            self.word(c, "complaint", crate::defects::WORDS)
                .map(str::to_string)
        });
        let material = self.material(&raw.material);
        let roll = self.roll(&raw.roll);
        let winding = self.winding(&raw.winding);
        let hardness = self.hardness(raw.hardness.as_ref());
        let wraps = self.wraps(raw.wraps.as_ref());
        let storage = self.storage(&raw.storage);
        let width = roll.as_ref().map(|r| r.width_m);
        let profiles = self.profiles(&raw.profiles, width, file);
        let (lane_edges_m, lane_count) = self.lanes(raw.lanes.as_ref(), width);
        let lab_creep = self.lab_creep(&raw.lab_creep);
        let converting = match raw.converting.as_ref().and_then(|c| c.tension.as_ref()) {
            Some(q) => self.q(q, "converting.tension", Kind::LineForce, Range::Positive),
            None => winding.as_ref().zip(roll.as_ref()).map(|(w, r)| {
                let t = w.tension.at(0.5 * (r.core_diameter_m + r.diameter_m));
                self.defaults.push(DefaultUsed {
                    field: "converting.tension".into(),
                    value: format!("{t:.0} N/m"),
                    source: "not given: assumed equal to the winding web tension".into(),
                });
                t
            }),
        };
        if let (Some(r), Some(w)) = (&roll, &winding) {
            if let Tension::Taper { points } = &w.tension {
                let (lo, hi) = (points[0].0, points[points.len() - 1].0);
                if lo > r.core_diameter_m * 1.5 || hi < r.diameter_m * 0.9 {
                    self.warnings.push(format!(
                        "winding.taper: table covers {:.0}-{:.0} mm but the roll builds from {:.0} to {:.0} mm; tension is held flat beyond the table",
                        lo * 1e3,
                        hi * 1e3,
                        r.core_diameter_m * 1e3,
                        r.diameter_m * 1e3
                    ));
                }
            }
        }
        if let (Some(m), Some(w)) = (&material, &winding) {
            let t = w.tension.at(0.0).max(1e-9);
            if m.friction * w.nip_n_per_m > 2.5 * t {
                self.warnings.push(format!(
                    "winding.nip: friction x nip ({:.0} N/m) is over 2.5x the web tension ({:.0} N/m); measured nip-induced tension saturates at such loads, so the model may overstate wound-in tension (common practice)",
                    m.friction * w.nip_n_per_m,
                    t
                ));
            }
        }
        Some(Case {
            source: file.to_string(),
            id: raw.case.clone(),
            title: raw.title.clone().unwrap_or_default(),
            complaint,
            notes: raw.notes.clone().unwrap_or_default(),
            material: material?,
            roll: roll?,
            winding: winding?,
            profiles: profiles?,
            storage: storage?,
            lane_edges_m,
            lane_count,
            hardness: hardness?,
            wraps: wraps?,
            converting_tension_n_per_m: converting?,
            lab_creep: lab_creep?,
            defaults: std::mem::take(&mut self.defaults),
            warnings: std::mem::take(&mut self.warnings),
        })
    }

    fn material(&mut self, m: &RawMaterial) -> Option<Material> {
        let grade = match Grade::parse(&m.grade.value) {
            Some(g) => g,
            None => {
                self.push(
                    "material.grade",
                    Some(line_of(&m.grade)),
                    format!(
                        "'{}' is not a grade class; use newsprint, coated, board, film or custom",
                        m.grade.value
                    ),
                );
                return None;
            }
        };
        let gd = defaults::for_grade(grade);
        let g = |f: fn(&defaults::GradeDefaults) -> Def| gd.as_ref().map(f);
        use Range::*;
        let caliper = self.or_default(
            m.caliper.as_ref(),
            "material.caliper",
            Kind::Length,
            Between(1e-6, 5e-3),
            g(|d| d.caliper),
        );
        let density = match (&m.density, &m.basis_weight) {
            (Some(_), Some(bw)) => {
                self.push(
                    "material.basis_weight",
                    Some(line_of(bw)),
                    "give density or basis_weight, not both".into(),
                );
                None
            }
            (None, Some(bw)) => {
                let gsm = self.q(bw, "material.basis_weight", Kind::Grammage, Positive);
                match (gsm, caliper) {
                    (Some(w), Some(c)) => self.check_range(
                        w / c,
                        "material.basis_weight",
                        Some(line_of(bw)),
                        Kind::Density,
                        Between(100.0, 3000.0),
                    ),
                    _ => None,
                }
            }
            (d, None) => self.or_default(
                d.as_ref(),
                "material.density",
                Kind::Density,
                Between(100.0, 3000.0),
                g(|d| d.density),
            ),
        };
        let md = self.or_default(
            m.md_modulus.as_ref(),
            "material.md_modulus",
            Kind::Pressure,
            Between(1e7, 1e12),
            g(|d| d.md_modulus),
        );
        let cd = self.or_default(
            m.cd_modulus.as_ref(),
            "material.cd_modulus",
            Kind::Pressure,
            Between(1e7, 1e12),
            g(|d| d.cd_modulus),
        );
        let poisson = self.or_default(
            m.poisson.as_ref(),
            "material.poisson",
            Kind::Number,
            Between(-0.5, 0.5),
            g(|d| d.poisson),
        );
        let stack = match (&m.stack, &m.radial_modulus) {
            (Some(_), Some(rm)) => {
                self.push(
                    "material.radial_modulus",
                    Some(line_of(rm)),
                    "give either stack (k1, k2) or radial_modulus, not both".into(),
                );
                None
            }
            (None, Some(rm)) => self
                .q(rm, "material.radial_modulus", Kind::Pressure, Positive)
                .map(|e| Stack::Constant {
                    radial_modulus_pa: e,
                }),
            (s, None) => {
                let k1 = self.or_default(
                    s.as_ref().map(|s| &s.k1),
                    "material.stack.k1",
                    Kind::Pressure,
                    Positive,
                    g(|d| d.k1),
                );
                let k2 = self.or_default(
                    s.as_ref().map(|s| &s.k2),
                    "material.stack.k2",
                    Kind::Number,
                    Between(1.0, 1e4),
                    g(|d| d.k2),
                );
                Some(Stack::Pfeiffer {
                    k1_pa: k1?,
                    k2: k2?,
                })
            }
        };
        let friction = self.or_default(
            m.friction.as_ref(),
            "material.friction",
            Kind::Number,
            Between(0.0, 2.0),
            g(|d| d.friction),
        );
        let hmd = self.or_default(
            m.hygro_md.as_ref(),
            "material.hygro_md",
            Kind::PerMoisture,
            Between(0.0, 0.05),
            g(|d| d.hygro_md),
        );
        let hcd = self.or_default(
            m.hygro_cd.as_ref(),
            "material.hygro_cd",
            Kind::PerMoisture,
            Between(0.0, 0.05),
            g(|d| d.hygro_cd),
        );
        let hzd = self.or_default(
            m.hygro_zd.as_ref(),
            "material.hygro_zd",
            Kind::PerMoisture,
            Between(0.0, 0.2),
            g(|d| d.hygro_zd),
        );
        let mc = self.or_default(
            m.moisture.as_ref(),
            "material.moisture",
            Kind::Moisture,
            Between(0.0, 40.0),
            g(|d| d.moisture),
        );
        let dip = self.or_default(
            m.diffusivity_inplane.as_ref(),
            "material.diffusivity_inplane",
            Kind::Diffusivity,
            Between(0.0, 1e-4),
            g(|d| d.diffusivity_inplane),
        );
        let dr = self.or_default(
            m.diffusivity_radial.as_ref(),
            "material.diffusivity_radial",
            Kind::Diffusivity,
            Between(0.0, 1e-4),
            g(|d| d.diffusivity_radial),
        );
        let s = m.sorption.as_ref();
        let gm = self.or_default(
            s.map(|s| &s.monolayer),
            "material.sorption.monolayer",
            Kind::Moisture,
            Between(0.0, 30.0),
            g(|d| d.gab_m),
        );
        let gc = self.or_default(
            s.map(|s| &s.c),
            "material.sorption.c",
            Kind::Number,
            Between(0.0, 1e4),
            g(|d| d.gab_c),
        );
        let gk = self.or_default(
            s.map(|s| &s.k),
            "material.sorption.k",
            Kind::Number,
            Between(0.0, 0.99),
            g(|d| d.gab_k),
        );
        let creep = self.creep(m.creep.as_ref(), gd.as_ref());
        Some(Material {
            grade,
            caliper_m: caliper?,
            density_kg_m3: density?,
            md_modulus_pa: md?,
            cd_modulus_pa: cd?,
            poisson: poisson?,
            stack: stack?,
            friction: friction?,
            hygro_md_per_pct: hmd?,
            hygro_cd_per_pct: hcd?,
            hygro_zd_per_pct: hzd?,
            moisture_pct: mc?,
            diffusivity_inplane_m2_s: dip?,
            diffusivity_radial_m2_s: dr?,
            sorption: Gab {
                monolayer_pct: gm?,
                c: gc?,
                k: gk?,
            },
            creep: creep?,
        })
    }

    fn burgers(
        &mut self,
        b: Option<&RawBurgers>,
        dir: &str,
        defs: Option<(Def, Def, Def)>,
    ) -> Option<Burgers> {
        use Range::*;
        let delayed = self.or_default(
            b.map(|b| &b.delayed),
            &format!("material.creep.{dir}.delayed"),
            Kind::Number,
            Between(0.0, 100.0),
            defs.map(|d| d.0),
        );
        let ret = self.or_default(
            b.map(|b| &b.retardation),
            &format!("material.creep.{dir}.retardation"),
            Kind::Duration,
            Positive,
            defs.map(|d| d.1),
        );
        let vis = self.or_default(
            b.map(|b| &b.viscous_time),
            &format!("material.creep.{dir}.viscous_time"),
            Kind::Duration,
            Positive,
            defs.map(|d| d.2),
        );
        Some(Burgers {
            delayed: delayed?,
            retardation_s: ret?,
            viscous_time_s: vis?,
        })
    }

    fn creep(
        &mut self,
        c: Option<&RawCreep>,
        gd: Option<&defaults::GradeDefaults>,
    ) -> Option<Creep> {
        use Range::*;
        let md = self.burgers(
            c.and_then(|c| c.md.as_ref()),
            "md",
            gd.map(|d| (d.md_delayed, d.md_retardation, d.md_viscous)),
        );
        let radial = self.burgers(
            c.and_then(|c| c.radial.as_ref()),
            "radial",
            gd.map(|d| (d.r_delayed, d.r_retardation, d.r_viscous)),
        );
        let ea = self.or_default(
            c.and_then(|c| c.activation_energy.as_ref()),
            "material.creep.activation_energy",
            Kind::MolarEnergy,
            Between(0.0, 1e6),
            gd.map(|d| d.activation),
        );
        let ms = self.or_default(
            c.and_then(|c| c.moisture_shift.as_ref()),
            "material.creep.moisture_shift",
            Kind::Number,
            Between(0.0, 5.0),
            gd.map(|d| d.moisture_shift),
        );
        let mso = self.or_default(
            c.and_then(|c| c.mechanosorptive.as_ref()),
            "material.creep.mechanosorptive",
            Kind::Number,
            Between(0.0, 100.0),
            gd.map(|d| d.mechanosorptive),
        );
        Some(Creep {
            md: md?,
            radial: radial?,
            activation_energy_j_mol: ea?,
            moisture_shift_dec_per_pct: ms?,
            mechanosorptive_per_pct: mso?,
        })
    }

    fn roll(&mut self, r: &RawRoll) -> Option<Roll> {
        use Range::*;
        let width = self.q(&r.width, "roll.width", Kind::Length, Between(1e-3, 20.0));
        let dia = self.q(
            &r.diameter,
            "roll.diameter",
            Kind::Length,
            Between(1e-3, 10.0),
        );
        let core_d = self.q(
            &r.core_diameter,
            "roll.core_diameter",
            Kind::Length,
            Between(1e-3, 10.0),
        );
        if let (Some(d), Some(c)) = (dia, core_d) {
            if c >= d {
                self.push(
                    "roll.core_diameter",
                    Some(line_of(&r.core_diameter)),
                    format!(
                        "core diameter {:.1} mm is not smaller than the roll diameter {:.1} mm; check both values and their units",
                        c * 1e3,
                        d * 1e3
                    ),
                );
                return None;
            }
        }
        let core = match &r.core {
            Some(RawCore {
                rigid: Some(rg),
                modulus,
                wall,
                ..
            }) => {
                if !rg.value {
                    self.push(
                        "roll.core.rigid",
                        Some(line_of(rg)),
                        "write `rigid: true`, or leave it out and give modulus and wall".into(),
                    );
                    return None;
                }
                if modulus.is_some() || wall.is_some() {
                    self.push(
                        "roll.core",
                        Some(line_of(rg)),
                        "a rigid core takes no modulus or wall; give one or the other".into(),
                    );
                    return None;
                }
                Some(Core::Rigid)
            }
            Some(RawCore {
                modulus: Some(m),
                wall: Some(wq),
                poisson,
                ..
            }) => {
                let e = self.q(m, "roll.core.modulus", Kind::Pressure, Positive);
                let w = self.q(wq, "roll.core.wall", Kind::Length, Positive);
                let nu = match poisson {
                    Some(p) => self.q(p, "roll.core.poisson", Kind::Number, Between(-0.5, 0.5)),
                    None => Some(0.3),
                };
                if let (Some(w), Some(c)) = (w, core_d) {
                    if w >= c / 2.0 {
                        self.push(
                            "roll.core.wall",
                            Some(line_of(wq)),
                            "core wall is thicker than the core radius; give the wall thickness"
                                .into(),
                        );
                        return None;
                    }
                }
                Some(Core::Tube {
                    modulus_pa: e?,
                    wall_m: w?,
                    poisson: nu?,
                })
            }
            Some(_) => {
                self.push(
                    "roll.core",
                    Some(line_of(&r.core_diameter)),
                    "give `rigid: true`, or both `modulus` and `wall` (and optionally `poisson`)"
                        .into(),
                );
                return None;
            }
            None => {
                let (de, dw, dn) = defaults::CORE;
                for (f, d) in [
                    ("roll.core.modulus", de),
                    ("roll.core.wall", dw),
                    ("roll.core.poisson", dn),
                ] {
                    self.defaults.push(DefaultUsed {
                        field: f.into(),
                        value: d.text.into(),
                        source: d.source.into(),
                    });
                }
                let wall = units::parse(dw.text, Kind::Length).ok()?;
                Some(Core::Tube {
                    modulus_pa: units::parse(de.text, Kind::Pressure).ok()?,
                    wall_m: core_d.map(|c| wall.min(0.4 * c / 2.0)).unwrap_or(wall),
                    poisson: 0.3,
                })
            }
        };
        Some(Roll {
            width_m: width?,
            diameter_m: dia?,
            core_diameter_m: core_d?,
            core: core?,
        })
    }

    fn winding(&mut self, w: &RawWinding) -> Option<Winding> {
        use Range::*;
        let tension = match (&w.tension, &w.taper) {
            (Some(q), None) => self
                .q(q, "winding.tension", Kind::LineForce, Positive)
                .map(|t| Tension::Constant { tension_n_per_m: t }),
            (Some(q), Some(_)) => {
                self.push(
                    "winding.taper",
                    Some(line_of(q)),
                    "give either tension (constant) or taper (a table), not both".into(),
                );
                None
            }
            (None, None) => {
                self.push(
                    "winding.tension",
                    None,
                    "missing: give `tension: \"2.0 pli\"` or a `taper:` table of {diameter, tension}".into(),
                );
                None
            }
            (None, Some(pts)) => {
                if pts.is_empty() {
                    self.push(
                        "winding.taper",
                        None,
                        "taper table is empty; give at least one {diameter, tension} point".into(),
                    );
                    None
                } else {
                    let mut out = Vec::new();
                    let mut ok = true;
                    for (i, p) in pts.iter().enumerate() {
                        let d = self.q(
                            &p.diameter,
                            &format!("winding.taper[{i}].diameter"),
                            Kind::Length,
                            Positive,
                        );
                        let t = self.q(
                            &p.tension,
                            &format!("winding.taper[{i}].tension"),
                            Kind::LineForce,
                            Positive,
                        );
                        match (d, t) {
                            (Some(d), Some(t)) => out.push((d, t)),
                            _ => ok = false,
                        }
                    }
                    if ok && out.windows(2).any(|p| p[1].0 <= p[0].0) {
                        self.push(
                            "winding.taper",
                            Some(line_of(&pts[0].diameter)),
                            "taper table diameters must increase from one point to the next".into(),
                        );
                        ok = false;
                    }
                    ok.then_some(Tension::Taper { points: out })
                }
            }
        };
        let nip = match &w.nip {
            Some(q) => self.q(q, "winding.nip", Kind::LineForce, NonNegative),
            None => {
                self.defaults.push(DefaultUsed {
                    field: "winding.nip".into(),
                    value: "0 N/m".into(),
                    source: "no nip given: centre winding without a nip assumed".into(),
                });
                Some(0.0)
            }
        };
        let speed = match &w.speed {
            Some(q) => self.q(q, "winding.speed", Kind::Speed, Between(0.0, 200.0)),
            None => {
                self.defaults.push(DefaultUsed {
                    field: "winding.speed".into(),
                    value: "0 m/s".into(),
                    source: "no speed given: centrifugal effects left out".into(),
                });
                Some(0.0)
            }
        };
        Some(Winding {
            tension: tension?,
            nip_n_per_m: nip?,
            speed_m_s: speed?,
        })
    }

    fn hardness(&mut self, h: Option<&RawHardness>) -> Option<Hardness> {
        use Range::*;
        let rep = self.or_default(
            h.and_then(|h| h.repeatability.as_ref()),
            "hardness.repeatability",
            Kind::Number,
            Positive,
            Some(defaults::HARDNESS_REPEAT),
        );
        let calibration = match h.and_then(|h| h.calibration.as_ref()) {
            Some(c) => {
                let a = self.q(&c.a, "hardness.calibration.a", Kind::Number, Any);
                let b = self.q(&c.b, "hardness.calibration.b", Kind::Number, Positive);
                let p = self.q(
                    &c.pressure_ref,
                    "hardness.calibration.pressure_ref",
                    Kind::Pressure,
                    Positive,
                );
                Some(Calibration {
                    a: a?,
                    b: b?,
                    pressure_ref_pa: p?,
                })
            }
            None => None,
        };
        Some(Hardness {
            scale: h
                .and_then(|h| h.scale.clone())
                .unwrap_or_else(|| "hardness units".into()),
            repeatability: rep?,
            calibration,
        })
    }

    fn wraps(&mut self, w: Option<&RawWraps>) -> Option<WrapPermeance> {
        let r = Range::Between(0.0, 1.0);
        let none = self.or_default(
            w.and_then(|w| w.none.as_ref()),
            "wraps.none",
            Kind::Permeance,
            r,
            Some(defaults::WRAP_NONE),
        );
        let paper = self.or_default(
            w.and_then(|w| w.paper.as_ref()),
            "wraps.paper",
            Kind::Permeance,
            r,
            Some(defaults::WRAP_PAPER),
        );
        let film = self.or_default(
            w.and_then(|w| w.film.as_ref()),
            "wraps.film",
            Kind::Permeance,
            r,
            Some(defaults::WRAP_FILM),
        );
        Some(WrapPermeance {
            none_m_s: none?,
            paper_m_s: paper?,
            film_m_s: film?,
        })
    }

    fn storage(&mut self, s: &[RawStretch]) -> Option<Vec<Stretch>> {
        use Range::*;
        let mut out = Vec::new();
        let mut ok = true;
        for (i, st) in s.iter().enumerate() {
            let f = |n: &str| format!("storage[{i}].{n}");
            let dur = self.q(&st.duration, &f("duration"), Kind::Duration, Positive);
            let t = self.q(
                &st.temperature,
                &f("temperature"),
                Kind::Temperature,
                Between(223.15, 373.15),
            );
            let rh = self.q(&st.rh, &f("rh"), Kind::Humidity, Between(0.0, 1.0));
            let wrap = |v: &mut Self, w: &Option<serde_saphyr::Spanned<String>>, n: &str| match w {
                None => Some(Wrap::None),
                Some(w) => v
                    .word(w, &f(n), &["none", "paper", "film"])
                    .map(|x| match x {
                        "paper" => Wrap::Paper,
                        "film" => Wrap::Film,
                        _ => Wrap::None,
                    }),
            };
            let bw = wrap(self, &st.barrel_wrap, "barrel_wrap");
            let ew = wrap(self, &st.end_wrap, "end_wrap");
            let stance = match &st.stance {
                None => Some(Stance::OnEnd),
                Some(w) => self.word(w, &f("stance"), &["on_end", "on_side"]).map(|x| {
                    if x == "on_side" {
                        Stance::OnSide
                    } else {
                        Stance::OnEnd
                    }
                }),
            };
            match (dur, t, rh, bw, ew, stance) {
                (Some(d), Some(t), Some(rh), Some(bw), Some(ew), Some(stance)) => {
                    out.push(Stretch {
                        duration_s: d,
                        temperature_k: t,
                        rh,
                        barrel_wrap: bw,
                        end_wrap: ew,
                        stance,
                        place: st.place.clone(),
                    })
                }
                _ => ok = false,
            }
        }
        ok.then_some(out)
    }

    fn profiles(
        &mut self,
        ps: &[RawProfile],
        width: Option<f64>,
        file: &str,
    ) -> Option<Vec<Profile>> {
        let mut out = Vec::new();
        let mut ok = true;
        for (i, p) in ps.iter().enumerate() {
            match self.profile(i, p, width, file) {
                Some(pr) => out.push(pr),
                None => ok = false,
            }
        }
        ok.then_some(out)
    }

    fn profile(
        &mut self,
        i: usize,
        p: &RawProfile,
        width: Option<f64>,
        file: &str,
    ) -> Option<Profile> {
        let f = |n: &str| format!("profiles[{i}].{n}");
        let what = match self.word(&p.what, &f("what"), &["hardness", "diameter", "caliper"])? {
            "hardness" => Measure::Hardness,
            "diameter" => Measure::Diameter,
            _ => Measure::Caliper,
        };
        let age = self.q(&p.age, &f("age"), Kind::Duration, Range::NonNegative);
        let pos_unit = p.position_unit.clone().unwrap_or_else(|| "mm".to_string());
        let val_unit = p.unit.clone().unwrap_or_default();
        if what != Measure::Hardness && val_unit.is_empty() {
            self.push(
                &f("unit"),
                Some(line_of(&p.what)),
                "caliper and diameter values need a unit, e.g. `unit: um` or `unit: mm`".into(),
            );
            return None;
        }
        let line = Some(line_of(&p.what));
        let (positions, values, origin): (Points, Points, String) =
            match (&p.csv, &p.positions, &p.values) {
                (Some(c), None, None) => self.read_csv(c, &f("csv"))?,
                (None, Some(ps), Some(vs)) => (
                    ps.value.iter().map(|&x| (x, Some(line_of(ps)))).collect(),
                    vs.value.iter().map(|&x| (x, Some(line_of(vs)))).collect(),
                    file.to_string(),
                ),
                (Some(c), _, _) => {
                    self.push(
                        &f("csv"),
                        Some(line_of(c)),
                        "give either csv or positions and values, not both".into(),
                    );
                    return None;
                }
                _ => {
                    self.push(
                        &f("values"),
                        line,
                        "a profile needs `positions` and `values` lists, or a `csv` file".into(),
                    );
                    return None;
                }
            };
        if positions.len() != values.len() {
            self.push(
                &f("values"),
                values.first().and_then(|v| v.1).or(line),
                format!(
                    "{} positions but {} values; each position needs exactly one value",
                    positions.len(),
                    values.len()
                ),
            );
            return None;
        }
        if positions.len() < 2 {
            self.push(
                &f("positions"),
                line,
                "a profile needs at least two positions across the width".into(),
            );
            return None;
        }
        let mut pos_si = Vec::new();
        let mut val_si = Vec::new();
        let mut ok = true;
        for (k, ((x, xl), (v, vl))) in positions.iter().zip(values.iter()).enumerate() {
            let xs = self.num_unit(
                *x,
                &pos_unit,
                &f(&format!("positions[{k}]")),
                *xl,
                Kind::Length,
            );
            let vs = if what == Measure::Hardness {
                if v.is_finite() {
                    Some(*v)
                } else {
                    self.push(
                        &f(&format!("values[{k}]")),
                        *vl,
                        "is not a finite number; remove the point or give its reading".into(),
                    );
                    None
                }
            } else {
                self.num_unit(
                    *v,
                    &val_unit,
                    &f(&format!("values[{k}]")),
                    *vl,
                    Kind::Length,
                )
                .and_then(|v| {
                    self.check_range(
                        v,
                        &f(&format!("values[{k}]")),
                        *vl,
                        Kind::Length,
                        Range::Positive,
                    )
                })
            };
            match (xs, vs) {
                (Some(x), Some(v)) => {
                    if let Some(w) = width {
                        if x < -1e-9 || x > w + 1e-9 {
                            self.push(
                                &f(&format!("positions[{k}]")),
                                *xl,
                                format!(
                                    "position {:.1} mm is outside the roll width (0 .. {:.1} mm); positions are measured from the front edge",
                                    x * 1e3,
                                    w * 1e3
                                ),
                            );
                            ok = false;
                            continue;
                        }
                    }
                    pos_si.push(x);
                    val_si.push(v);
                }
                _ => ok = false,
            }
        }
        if ok && pos_si.windows(2).any(|w| w[1] <= w[0]) {
            self.push(
                &f("positions"),
                positions.first().and_then(|p| p.1),
                "positions must increase from the front edge to the back edge".into(),
            );
            ok = false;
        }
        if !ok {
            return None;
        }
        Some(Profile {
            what,
            age_s: age?,
            positions_m: pos_si,
            values: val_si,
            origin,
        })
    }

    fn num_unit(
        &mut self,
        x: f64,
        unit: &str,
        field: &str,
        line: Option<u64>,
        kind: Kind,
    ) -> Option<f64> {
        if !x.is_finite() {
            self.push(
                field,
                line,
                "is not a finite number; give a real value".into(),
            );
            return None;
        }
        match units::parse(&format!("{x} {unit}"), kind) {
            Ok(v) => Some(v),
            Err(e) => {
                self.push(field, line, format!("{e}"));
                None
            }
        }
    }

    fn read_csv(
        &mut self,
        c: &serde_saphyr::Spanned<String>,
        field: &str,
    ) -> Option<(Points, Points, String)> {
        let path = match &self.base {
            Some(b) => b.join(&c.value),
            None => PathBuf::from(&c.value),
        };
        let shown = path.display().to_string();
        let mut rdr = match csv::ReaderBuilder::new()
            .trim(csv::Trim::All)
            .from_path(&path)
        {
            Ok(r) => r,
            Err(e) => {
                self.push(
                    field,
                    Some(line_of(c)),
                    format!(
                        "cannot read CSV '{shown}': {e}; the path is relative to the case file"
                    ),
                );
                return None;
            }
        };
        let headers = match rdr.headers() {
            Ok(h) => h.clone(),
            Err(e) => {
                self.push(field, Some(line_of(c)), format!("{shown}: {e}"));
                return None;
            }
        };
        let col = |name: &str| headers.iter().position(|h| h.eq_ignore_ascii_case(name));
        let (Some(pc), Some(vc)) = (col("position"), col("value")) else {
            self.push(
                field,
                Some(line_of(c)),
                format!("{shown}: needs a header line with columns `position` and `value`"),
            );
            return None;
        };
        let mut ps = Vec::new();
        let mut vs = Vec::new();
        for (k, rec) in rdr.records().enumerate() {
            let lineno = k as u64 + 2;
            let rec = match rec {
                Ok(r) => r,
                Err(e) => {
                    self.push(field, Some(line_of(c)), format!("{shown}:{lineno}: {e}"));
                    return None;
                }
            };
            let get = |i: usize| rec.get(i).and_then(|s| s.parse::<f64>().ok());
            match (get(pc), get(vc)) {
                (Some(p), Some(v)) if p.is_finite() && v.is_finite() => {
                    ps.push((p, None));
                    vs.push((v, None));
                }
                _ => {
                    self.push(
                        field,
                        Some(line_of(c)),
                        format!("{shown}:{lineno}: position and value must be finite numbers"),
                    );
                    return None;
                }
            }
        }
        Some((ps, vs, shown))
    }

    fn lab_creep(&mut self, tests: &[RawLabCreep]) -> Option<Vec<LabCreep>> {
        let mut out = Vec::new();
        let mut ok = true;
        for (i, t) in tests.iter().enumerate() {
            let f = |n: &str| format!("lab_creep[{i}].{n}");
            let dir = self.word(&t.direction, &f("direction"), &["md", "radial"]);
            let stress = self.q(&t.stress, &f("stress"), Kind::Pressure, Range::Positive);
            let temp = match &t.temperature {
                Some(q) => self.q(
                    q,
                    &f("temperature"),
                    Kind::Temperature,
                    Range::Between(223.15, 373.15),
                ),
                None => Some(296.15),
            };
            let rh = match &t.rh {
                Some(q) => self.q(q, &f("rh"), Kind::Humidity, Range::Between(0.0, 1.0)),
                None => Some(0.5),
            };
            let unit = t.time_unit.value.clone();
            let n_t = t.times.value.len();
            let n_s = t.strains.value.len();
            if n_t != n_s || n_t < 4 {
                self.push(
                    &f("strains"),
                    Some(line_of(&t.strains)),
                    format!("{n_t} times but {n_s} strains; give at least four points, one strain per time"),
                );
                ok = false;
                continue;
            }
            let mut times = Vec::new();
            for (k, x) in t.times.value.iter().enumerate() {
                let field = f(&format!("times[{k}]"));
                match self.num_unit(*x, &unit, &field, Some(line_of(&t.times)), Kind::Duration) {
                    Some(v) if v > 0.0 => times.push(v),
                    Some(_) => {
                        self.push(
                            &field,
                            Some(line_of(&t.times)),
                            "times must be after loading (greater than zero)".into(),
                        );
                        ok = false;
                    }
                    None => ok = false,
                }
            }
            let strains: Vec<f64> = t.strains.value.clone();
            if strains.iter().any(|s| !s.is_finite() || *s <= 0.0) {
                self.push(
                    &f("strains"),
                    Some(line_of(&t.strains)),
                    "strains must be positive finite numbers (as fractions, e.g. 0.0015)".into(),
                );
                ok = false;
            }
            if times.windows(2).any(|w| w[1] <= w[0]) {
                self.push(
                    &f("times"),
                    Some(line_of(&t.times)),
                    "times must increase".into(),
                );
                ok = false;
            }
            match (dir, stress, temp, rh) {
                (Some(d), Some(s), Some(tk), Some(rh)) => out.push(LabCreep {
                    direction: d.to_string(),
                    stress_pa: s,
                    temperature_k: tk,
                    rh,
                    times_s: times,
                    strains,
                }),
                _ => ok = false,
            }
        }
        ok.then_some(out)
    }

    fn lanes(
        &mut self,
        l: Option<&RawLanes>,
        width: Option<f64>,
    ) -> (Option<Vec<f64>>, Option<usize>) {
        let Some(l) = l else { return (None, None) };
        let count = l.count.as_ref().and_then(|c| {
            if (1..=400).contains(&c.value) {
                Some(c.value as usize)
            } else {
                self.push(
                    "lanes.count",
                    Some(line_of(c)),
                    "must be between 1 and 400".into(),
                );
                None
            }
        });
        let edges = l.edges.as_ref().and_then(|es| {
            let mut v = Vec::new();
            for (i, e) in es.iter().enumerate() {
                v.push(self.q(
                    e,
                    &format!("lanes.edges[{i}]"),
                    Kind::Length,
                    Range::NonNegative,
                )?);
            }
            if v.len() < 2 || v.windows(2).any(|w| w[1] <= w[0]) {
                self.push(
                    "lanes.edges",
                    es.first().map(line_of),
                    "need at least two increasing edges".into(),
                );
                return None;
            }
            if let Some(w) = width {
                if v[v.len() - 1] > w + 1e-9 {
                    self.push(
                        "lanes.edges",
                        es.first().map(line_of),
                        "the last edge is beyond the roll width".into(),
                    );
                    return None;
                }
            }
            Some(v)
        });
        (edges, count)
    }
}

/// Allowed range of a value.
#[derive(Clone, Copy)]
enum Range {
    Any,
    Positive,
    NonNegative,
    /// Closed range [lo, hi].
    Between(f64, f64),
}

impl Range {
    fn bounds(self) -> (f64, f64, &'static str) {
        match self {
            Range::Any => (f64::NEG_INFINITY, f64::INFINITY, "finite"),
            Range::Positive => (0.0, f64::INFINITY, "greater than zero"),
            Range::NonNegative => (0.0, f64::INFINITY, "zero or more"),
            Range::Between(a, b) => (a, b, "within"),
        }
    }
    fn open_low(self) -> bool {
        matches!(self, Range::Positive)
    }
}

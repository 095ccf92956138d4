//! What a reader wants the user to know about a file it read: data, which
//! each front end words as it likes ([`std::fmt::Display`] gives the plain
//! wording, naming the file).

use std::path::PathBuf;

use gradewright_geometry::{Units, excerpt, trimmed};

/// One thing to know about a file that was read.
#[derive(Clone, Debug, PartialEq)]
pub struct Note {
    /// The file.
    pub path: PathBuf,
    /// What there is to know.
    pub kind: NoteKind,
}

/// The units a file's lengths were in, as a person says them.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum FileLengths {
    /// Metres (or a metric unit scaled to them).
    Metres,
    /// International feet (or an imperial unit scaled to them).
    Feet,
    /// US survey feet.
    UsSurveyFeet,
}

impl FileLengths {
    /// `metres`, `feet` or `US survey feet`.
    pub fn words(self) -> &'static str {
        match self {
            Self::Metres => "metres",
            Self::Feet => "feet",
            Self::UsSurveyFeet => "US survey feet",
        }
    }

    /// The lengths of a unit system.
    pub fn of(units: Units) -> Self {
        match units {
            Units::Metric => Self::Metres,
            Units::UsCustomary => Self::Feet,
        }
    }
}

/// What a reader noted.
#[derive(Clone, Debug, PartialEq)]
pub enum NoteKind {
    /// Rows were not in station order and were sorted.
    Sorted,
    /// Repeated rows (the same station and elevation) were dropped.
    RepeatsDropped {
        /// How many.
        count: usize,
    },
    /// An older LandXML namespace, read as 1.2.
    OlderNamespace {
        /// The namespace given.
        namespace: String,
    },
    /// No namespace at all, read as LandXML 1.2.
    NoNamespace,
    /// A national or agency application profile: LandXML 1.2's elements
    /// under the profile's own namespace, read as LandXML 1.2.
    ApplicationProfile {
        /// The namespace read.
        namespace: String,
    },
    /// A file in another encoding than UTF-8, converted.
    Encoding {
        /// The encoding the file declares.
        encoding: String,
    },
    /// An `elevationUnit` that is not the linear unit, not used.
    ElevationUnitUnused {
        /// As given.
        given: String,
        /// The linear unit used instead.
        linear_unit: String,
    },
    /// The lengths were read as given.
    Lengths {
        /// In which units.
        lengths: FileLengths,
        /// The `linearUnit` as written.
        linear_unit: String,
    },
    /// The lengths were converted to other units.
    Converted {
        /// From which.
        from: FileLengths,
        /// The `linearUnit` as written.
        linear_unit: String,
        /// To which.
        to: Units,
        /// The factor applied.
        scale: f64,
    },
    /// A linear unit of the same system (millimetres, miles) scaled to its base.
    Scaled {
        /// The `linearUnit` as written.
        linear_unit: String,
        /// The system's base unit it was scaled to.
        to: Units,
        /// The factor applied.
        scale: f64,
    },
    /// Circular vertical curves read as parabolas of the same length.
    CircularCurves {
        /// How many.
        count: usize,
    },
    /// A circular vertical curve whose stated length is not the length of
    /// its parabola, L = A·R (the parabola's length is used).
    CircularLength {
        /// The PVI's station, as read.
        station: f64,
        /// The element's line.
        line: u64,
        /// The length the file states.
        stated: f64,
        /// A·R, the length used.
        from_radius: f64,
    },
    /// Elements of a design profile that were skipped.
    Skipped {
        /// The design profile.
        profile: String,
        /// The elements' names, each once.
        elements: Vec<String>,
    },
    /// Elements of another vocabulary (namespace) in an alignment's
    /// profiles, not read.
    Foreign {
        /// The alignment.
        alignment: String,
        /// The elements, as `{namespace}name`, each once.
        elements: Vec<String>,
    },
    /// A ground line in several point lists, joined.
    PointListsJoined {
        /// The ground line.
        surface: String,
        /// How many lists.
        lists: usize,
    },
    /// An alignment with station equations: applied (stations shown and
    /// typed as plan stations).
    StationEquations {
        /// The alignment.
        alignment: String,
        /// How many.
        count: usize,
    },
    /// An alignment with horizontal geometry (`CoordGeom`): kept as read
    /// and written back around the profile, or not kept when the file's
    /// values were converted to other units.
    HorizontalGeometry {
        /// The alignment.
        alignment: String,
        /// Whether the file is kept to be written back.
        kept: bool,
    },
    /// Elements whose character data a comment or processing instruction
    /// split: their data was read whole, the pieces joined.
    DataAroundComments {
        /// Which element.
        element: &'static str,
        /// How many.
        count: usize,
    },
    /// The design speed the file gives the alignment.
    DesignSpeed {
        /// The speed as written (km/h or mph).
        speed: f64,
        /// The file's units.
        file_units: Units,
        /// The speed in the units read.
        converted: f64,
        /// The units read.
        units: Units,
    },
    /// PVIs outside their alignment's stations, read as given.
    OutsideAlignment {
        /// How many.
        count: usize,
        /// The alignment.
        alignment: String,
        /// Its first station.
        start: f64,
        /// Its last station.
        end: f64,
    },
}

impl NoteKind {
    /// Whether the note only says what units were read (nothing changed).
    pub fn is_units_read(&self) -> bool {
        matches!(self, Self::Lengths { .. })
    }
}

impl std::fmt::Display for Note {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}: ", self.path.display())?;
        let to_words = |u: Units| FileLengths::of(u).words();
        match &self.kind {
            NoteKind::Sorted => write!(f, "the rows were not in station order; sorted"),
            NoteKind::RepeatsDropped { count } => write!(f, "{count} repeated row(s) dropped"),
            NoteKind::OlderNamespace { namespace } => write!(f, "namespace {namespace} read as LandXML 1.2"),
            NoteKind::NoNamespace => write!(f, "no namespace; read as LandXML 1.2"),
            NoteKind::ApplicationProfile { namespace } => write!(
                f,
                "namespace {} read as a LandXML 1.2 application profile (root LandXML, version 1.2); \
                 its own elements are not read",
                excerpt(namespace)
            ),
            NoteKind::Encoding { encoding } => {
                write!(f, "text in {} converted to UTF-8 (a LandXML export writes UTF-8)", excerpt(encoding))
            }
            NoteKind::ElevationUnitUnused { given, linear_unit } => write!(
                f,
                "elevationUnit=\"{given}\" is not used: profile elevations are in the linear unit ({linear_unit})"
            ),
            NoteKind::Lengths { lengths, linear_unit } => {
                write!(f, "lengths in {} (linearUnit=\"{linear_unit}\")", lengths.words())
            }
            NoteKind::Converted { from, linear_unit, to, scale } => write!(
                f,
                "lengths converted from {} (linearUnit=\"{linear_unit}\") to {} (x {scale})",
                from.words(),
                to_words(*to)
            ),
            NoteKind::Scaled { linear_unit, to, scale } => {
                write!(f, "{linear_unit} converted to {} (x {scale})", to_words(*to))
            }
            NoteKind::CircularCurves { count } => write!(
                f,
                "{count} circular vertical curve(s) (CircCurve) read as the parabola of the same radius at the PVI \
                 (r = 1/R, so L = A·R); check them"
            ),
            NoteKind::CircularLength { station, line, stated, from_radius } => write!(
                f,
                "line {line}: the CircCurve at station {} states length {} but A·R gives {}; \
                 the length from the radius is used (check the file)",
                trimmed(*station, 3),
                trimmed(*stated, 3),
                trimmed(*from_radius, 3)
            ),
            NoteKind::Skipped { profile, elements } => {
                write!(f, "skipped in ProfAlign '{}': {}", excerpt(profile), elements.join(", "))
            }
            NoteKind::Foreign { alignment, elements } => write!(
                f,
                "skipped in alignment '{}': {} (not LandXML's namespace)",
                excerpt(alignment),
                elements.join(", ")
            ),
            NoteKind::PointListsJoined { surface, lists } => write!(
                f,
                "ground line '{}' has {lists} point lists; the gaps between them are bridged by straight lines",
                excerpt(surface)
            ),
            NoteKind::StationEquations { alignment, count } => write!(
                f,
                "alignment '{}' has {count} station equation(s): applied, so stations are shown and typed as \
                 plan stations (the PVIs' stations in the file are internal stations)",
                excerpt(alignment)
            ),
            NoteKind::HorizontalGeometry { alignment, kept: true } => write!(
                f,
                "alignment '{}' has horizontal geometry: kept as read; Gradewright edits the profile only",
                excerpt(alignment)
            ),
            NoteKind::HorizontalGeometry { alignment, kept: false } => write!(
                f,
                "alignment '{}' has horizontal geometry, not kept: the values were converted to other units \
                 (open the file in its own units to write it back with its plan geometry)",
                excerpt(alignment)
            ),
            NoteKind::DataAroundComments { element, count } => write!(
                f,
                "{count} {element} element(s) hold a comment or processing instruction inside their numbers; \
                 their text was read whole, the pieces joined as XML reads them (check those values)"
            ),
            NoteKind::DesignSpeed { speed, file_units, converted, units } => {
                write!(
                    f,
                    "design speed {} {} read from the file",
                    trimmed(*speed, 2),
                    file_units.speed_symbol()
                )?;
                if file_units != units {
                    write!(f, " ({} {})", trimmed(*converted, 2), units.speed_symbol())?;
                }
                Ok(())
            }
            NoteKind::OutsideAlignment { count, alignment, start, end } => write!(
                f,
                "{count} PVI(s) lie outside alignment '{}' (stations {start} to {end}); read as given",
                excerpt(alignment)
            ),
        }
    }
}

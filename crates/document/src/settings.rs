//! The editor's and the export's settings, kept with the project: how PVIs
//! snap, and how the sheet and tables are written.

use serde::{Deserialize, Serialize};

/// How the editor snaps dragged and inserted PVIs, kept with the project.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct Snap {
    /// Whether snapping is on.
    pub on: bool,
    /// Station increment (a whole metre or foot by default).
    pub station: f64,
    /// Elevation increment.
    pub elevation: f64,
}

impl Default for Snap {
    fn default() -> Self {
        Self { on: true, station: 1.0, elevation: 0.01 }
    }
}

impl Snap {
    /// `(station, elevation)` rounded to the increments when snapping is on.
    pub fn apply(self, station: f64, elevation: f64) -> (f64, f64) {
        if !self.on {
            return (station, elevation);
        }
        let round =
            |v: f64, step: f64| if step > 0.0 && step.is_finite() { (v / step).round() * step } else { v };
        (round(station, self.station), round(elevation, self.elevation))
    }

    pub(crate) fn is_default(&self) -> bool {
        *self == Self::default()
    }
}

/// How the sheet and tables are exported, kept with the project.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct ExportSettings {
    /// Sheet size: `ansi-b`, `ansi-d`, `a3`, `a1`, `WxHmm`, `WxHin`.
    pub sheet: String,
    /// PNG resolution, dpi.
    pub dpi: f64,
    /// Horizontal scale (1:N, or 1 in = N ft); `None` fits one sheet.
    pub h_scale: Option<f64>,
    /// Vertical scale; `None` is a tenth of the horizontal.
    pub v_scale: Option<f64>,
    /// Overlap between sheets.
    pub overlap: f64,
    /// Title block: road or section.
    pub road: String,
    /// Title block: designer.
    pub designer: String,
    /// Title block: checker.
    pub checker: String,
    /// Title block: date.
    pub date: String,
    /// Title block: revision.
    pub revision: String,
    /// Whether the sight-distance band is drawn.
    pub sight_band: bool,
    /// Write PNG.
    pub png: bool,
    /// Write SVG.
    pub svg: bool,
    /// Write PDF.
    pub pdf: bool,
    /// Write the CSV tables.
    pub tables: bool,
    /// Where: the sheet files are this path with each format's extension, the
    /// tables go in a folder of this name.
    pub path: String,
    /// Station interval of `stations.csv`; `None` is 20 m or 50 ft.
    pub interval: Option<f64>,
    /// Folder for File ▸ Export tables… (empty: beside the project file).
    pub tables_path: String,
    /// How the tables round their numbers.
    pub decimals: TableDecimals,
}

/// How the hand-over tables round their numbers.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(try_from = "DecimalsAsWritten")]
pub enum TableDecimals {
    /// As a plan shows them: stations, lengths and elevations to 0.001 m or
    /// 0.01 ft, grades to 0.001 %, K to 0.1, areas and volumes to 0.1
    /// (common practice).
    #[default]
    Plan,
    /// Every number to this many decimals (0 to 15).
    Fixed(u8),
    /// Unrounded: the shortest text that reads back to the same number.
    Exact,
}

impl TableDecimals {
    /// The most decimals [`TableDecimals::Fixed`] may ask for.
    pub const MAX: u8 = 15;
}

/// [`TableDecimals`] as a file writes it, before the count is checked.
#[derive(Deserialize)]
enum DecimalsAsWritten {
    Plan,
    Fixed(u8),
    Exact,
}

impl TryFrom<DecimalsAsWritten> for TableDecimals {
    type Error = String;

    fn try_from(value: DecimalsAsWritten) -> Result<Self, Self::Error> {
        match value {
            DecimalsAsWritten::Plan => Ok(Self::Plan),
            DecimalsAsWritten::Exact => Ok(Self::Exact),
            DecimalsAsWritten::Fixed(n) if n <= Self::MAX => Ok(Self::Fixed(n)),
            DecimalsAsWritten::Fixed(n) => Err(format!("decimals: {n} is more than {}", Self::MAX)),
        }
    }
}

impl Default for ExportSettings {
    fn default() -> Self {
        Self {
            sheet: "ansi-b".to_owned(),
            dpi: 150.0,
            h_scale: None,
            v_scale: None,
            overlap: 0.0,
            road: String::new(),
            designer: String::new(),
            checker: String::new(),
            date: String::new(),
            revision: String::new(),
            sight_band: true,
            png: true,
            svg: false,
            pdf: true,
            tables: true,
            path: String::new(),
            interval: None,
            tables_path: String::new(),
            decimals: TableDecimals::Plan,
        }
    }
}

impl ExportSettings {
    pub(crate) fn is_default(&self) -> bool {
        *self == Self::default()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn table_decimals_round_trip_and_refuse_too_many() {
        for d in
            [TableDecimals::Plan, TableDecimals::Exact, TableDecimals::Fixed(0), TableDecimals::Fixed(15)]
        {
            let text = ron::to_string(&d).unwrap_or_default();
            assert_eq!(ron::from_str::<TableDecimals>(&text).ok(), Some(d), "{text}");
        }
        let err =
            ron::from_str::<TableDecimals>("Fixed(16)").err().map(|e| e.to_string()).unwrap_or_default();
        assert!(err.contains("16 is more than 15"), "{err}");
    }
}

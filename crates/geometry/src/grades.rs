//! Maximum grades by road class, area and terrain, from the Green Book's
//! tables (AASHTO, *A Policy on Geometric Design of Highways and Streets*,
//! 2018: Table 5-2 rural local roads, §5.3 urban local streets, Table 6-2
//! rural collectors, Table 6-8 urban collectors, Table 7-2 rural arterials,
//! Table 7-10 urban arterials, Table 8-1 freeways), each in its metric and
//! its US customary edition. Every value here is recalled, not read (from
//! memory); the rows of the local-road table for level terrain agree with
//! TxDOT *Roadway Design Manual* (2020) Table 4-11.

use serde::{Deserialize, Serialize};

use crate::Units;

/// Terrain class for the default maximum grade.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum Terrain {
    /// Level terrain.
    Level,
    /// Rolling terrain.
    #[default]
    Rolling,
    /// Mountainous terrain.
    Mountainous,
}

impl Terrain {
    /// All classes, flattest first.
    pub const ALL: [Self; 3] = [Self::Level, Self::Rolling, Self::Mountainous];

    /// Display name.
    pub fn label(self) -> &'static str {
        match self {
            Self::Level => "level",
            Self::Rolling => "rolling",
            Self::Mountainous => "mountainous",
        }
    }

    fn row(self) -> usize {
        match self {
            Self::Level => 0,
            Self::Rolling => 1,
            Self::Mountainous => 2,
        }
    }
}

/// Functional class of the road, for the default maximum grade.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum RoadClass {
    /// Local road or street.
    Local,
    /// Collector.
    Collector,
    /// Arterial.
    #[default]
    Arterial,
    /// Freeway.
    Freeway,
}

impl RoadClass {
    /// All classes.
    pub const ALL: [Self; 4] = [Self::Local, Self::Collector, Self::Arterial, Self::Freeway];

    /// Display name.
    pub fn label(self) -> &'static str {
        match self {
            Self::Local => "local",
            Self::Collector => "collector",
            Self::Arterial => "arterial",
            Self::Freeway => "freeway",
        }
    }
}

/// Rural or urban setting, for the default maximum grade.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum Area {
    /// Rural.
    #[default]
    Rural,
    /// Urban.
    Urban,
}

impl Area {
    /// Both settings.
    pub const ALL: [Self; 2] = [Self::Rural, Self::Urban];

    /// Display name.
    pub fn label(self) -> &'static str {
        match self {
            Self::Rural => "rural",
            Self::Urban => "urban",
        }
    }
}

/// One table: design speeds (mph or km/h, as its edition) and grades per
/// terrain row.
struct Table {
    name: &'static str,
    speeds: &'static [f64],
    grades: [&'static [f64]; 3],
}

const RURAL_LOCAL: Table = Table {
    name: "Table 5-2 (rural local roads)",
    speeds: &[15.0, 20.0, 25.0, 30.0, 35.0, 40.0, 45.0, 50.0, 55.0, 60.0],
    grades: [
        &[9.0, 8.0, 7.0, 7.0, 7.0, 7.0, 7.0, 6.0, 6.0, 5.0],
        &[12.0, 11.0, 11.0, 10.0, 10.0, 10.0, 9.0, 8.0, 7.0, 6.0],
        &[17.0, 16.0, 15.0, 14.0, 13.0, 12.0, 11.0, 10.0, 10.0, 10.0],
    ],
};

const RURAL_LOCAL_METRIC: Table = Table {
    name: "Table 5-2 (rural local roads, metric)",
    speeds: &[20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0, 100.0],
    grades: [
        &[9.0, 8.0, 7.0, 7.0, 7.0, 7.0, 6.0, 6.0, 5.0],
        &[12.0, 11.0, 11.0, 10.0, 10.0, 9.0, 8.0, 7.0, 6.0],
        &[17.0, 16.0, 15.0, 14.0, 13.0, 12.0, 10.0, 10.0, 10.0],
    ],
};

const URBAN_LOCAL: Table = Table {
    name: "§5.3 (urban local streets: residential under 15 %; commercial and industrial under 8 %, enter as an override)",
    speeds: &[15.0],
    grades: [&[15.0], &[15.0], &[15.0]],
};

const URBAN_LOCAL_METRIC: Table = Table {
    name: "§5.3 (urban local streets, metric: residential under 15 %; commercial and industrial under 8 %, enter as an override)",
    speeds: &[20.0],
    grades: [&[15.0], &[15.0], &[15.0]],
};

const RURAL_COLLECTOR: Table = Table {
    name: "Table 6-2 (rural collectors)",
    speeds: &[20.0, 25.0, 30.0, 35.0, 40.0, 45.0, 50.0, 55.0, 60.0],
    grades: [
        &[7.0, 7.0, 7.0, 7.0, 7.0, 7.0, 6.0, 6.0, 5.0],
        &[10.0, 10.0, 9.0, 9.0, 8.0, 8.0, 7.0, 7.0, 6.0],
        &[12.0, 11.0, 10.0, 10.0, 10.0, 10.0, 9.0, 9.0, 8.0],
    ],
};

const RURAL_COLLECTOR_METRIC: Table = Table {
    name: "Table 6-2 (rural collectors, metric)",
    speeds: &[20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0, 100.0],
    grades: [
        &[7.0, 7.0, 7.0, 7.0, 7.0, 6.0, 6.0, 6.0, 5.0],
        &[10.0, 10.0, 9.0, 9.0, 8.0, 7.0, 7.0, 6.0, 6.0],
        &[12.0, 11.0, 10.0, 10.0, 10.0, 9.0, 9.0, 8.0, 8.0],
    ],
};

const URBAN_COLLECTOR: Table = Table {
    name: "Table 6-8 (urban collectors)",
    speeds: &[20.0, 25.0, 30.0, 35.0, 40.0, 45.0, 50.0, 55.0, 60.0],
    grades: [
        &[9.0, 9.0, 9.0, 9.0, 9.0, 8.0, 7.0, 7.0, 6.0],
        &[12.0, 12.0, 11.0, 10.0, 10.0, 9.0, 8.0, 8.0, 7.0],
        &[14.0, 13.0, 12.0, 12.0, 12.0, 11.0, 10.0, 10.0, 9.0],
    ],
};

const URBAN_COLLECTOR_METRIC: Table = Table {
    name: "Table 6-8 (urban collectors, metric)",
    speeds: &[20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0, 100.0],
    grades: [
        &[9.0, 9.0, 9.0, 9.0, 8.0, 7.0, 7.0, 6.0, 6.0],
        &[12.0, 12.0, 11.0, 10.0, 9.0, 8.0, 8.0, 7.0, 7.0],
        &[14.0, 13.0, 12.0, 12.0, 11.0, 10.0, 10.0, 9.0, 9.0],
    ],
};

const RURAL_ARTERIAL: Table = Table {
    name: "Table 7-2 (rural arterials)",
    speeds: &[40.0, 45.0, 50.0, 55.0, 60.0, 65.0, 70.0, 75.0, 80.0],
    grades: [
        &[5.0, 5.0, 4.0, 4.0, 3.0, 3.0, 3.0, 3.0, 3.0],
        &[6.0, 6.0, 5.0, 5.0, 4.0, 4.0, 4.0, 4.0, 4.0],
        &[8.0, 7.0, 7.0, 6.0, 6.0, 5.0, 5.0, 5.0, 5.0],
    ],
};

const RURAL_ARTERIAL_METRIC: Table = Table {
    name: "Table 7-2 (rural arterials, metric)",
    speeds: &[60.0, 70.0, 80.0, 90.0, 100.0, 110.0, 120.0, 130.0],
    grades: [
        &[5.0, 5.0, 4.0, 4.0, 3.0, 3.0, 3.0, 3.0],
        &[6.0, 6.0, 5.0, 5.0, 4.0, 4.0, 4.0, 4.0],
        &[8.0, 7.0, 7.0, 6.0, 6.0, 5.0, 5.0, 5.0],
    ],
};

const URBAN_ARTERIAL: Table = Table {
    name: "Table 7-10 (urban arterials)",
    speeds: &[30.0, 35.0, 40.0, 45.0, 50.0, 55.0, 60.0],
    grades: [
        &[8.0, 7.0, 7.0, 6.0, 6.0, 5.0, 5.0],
        &[9.0, 8.0, 8.0, 7.0, 7.0, 6.0, 6.0],
        &[11.0, 10.0, 10.0, 9.0, 9.0, 8.0, 8.0],
    ],
};

const URBAN_ARTERIAL_METRIC: Table = Table {
    name: "Table 7-10 (urban arterials, metric)",
    speeds: &[50.0, 60.0, 70.0, 80.0, 90.0, 100.0],
    grades: [
        &[8.0, 7.0, 6.0, 6.0, 5.0, 5.0],
        &[9.0, 8.0, 7.0, 7.0, 6.0, 6.0],
        &[11.0, 10.0, 9.0, 9.0, 8.0, 8.0],
    ],
};

const FREEWAY: Table = Table {
    name: "Table 8-1 (freeways)",
    speeds: &[50.0, 55.0, 60.0, 65.0, 70.0, 75.0, 80.0],
    grades: [
        &[4.0, 4.0, 3.0, 3.0, 3.0, 3.0, 3.0],
        &[5.0, 5.0, 4.0, 4.0, 4.0, 4.0, 4.0],
        &[6.0, 6.0, 6.0, 5.0, 5.0, 5.0, 5.0],
    ],
};

const FREEWAY_METRIC: Table = Table {
    name: "Table 8-1 (freeways, metric)",
    speeds: &[80.0, 90.0, 100.0, 110.0, 120.0, 130.0],
    grades: [
        &[4.0, 4.0, 3.0, 3.0, 3.0, 3.0],
        &[5.0, 5.0, 4.0, 4.0, 4.0, 4.0],
        &[6.0, 6.0, 6.0, 5.0, 5.0, 5.0],
    ],
};

/// The table of a class and area in the edition of `units`: the metric
/// edition's own rows in km/h, the US customary edition's in mph.
fn table(class: RoadClass, area: Area, units: Units) -> &'static Table {
    let metric = units == Units::Metric;
    match (class, area) {
        (RoadClass::Local, Area::Rural) if metric => &RURAL_LOCAL_METRIC,
        (RoadClass::Local, Area::Rural) => &RURAL_LOCAL,
        (RoadClass::Local, Area::Urban) if metric => &URBAN_LOCAL_METRIC,
        (RoadClass::Local, Area::Urban) => &URBAN_LOCAL,
        (RoadClass::Collector, Area::Rural) if metric => &RURAL_COLLECTOR_METRIC,
        (RoadClass::Collector, Area::Rural) => &RURAL_COLLECTOR,
        (RoadClass::Collector, Area::Urban) if metric => &URBAN_COLLECTOR_METRIC,
        (RoadClass::Collector, Area::Urban) => &URBAN_COLLECTOR,
        (RoadClass::Arterial, Area::Rural) if metric => &RURAL_ARTERIAL_METRIC,
        (RoadClass::Arterial, Area::Rural) => &RURAL_ARTERIAL,
        (RoadClass::Arterial, Area::Urban) if metric => &URBAN_ARTERIAL_METRIC,
        (RoadClass::Arterial, Area::Urban) => &URBAN_ARTERIAL,
        (RoadClass::Freeway, _) if metric => &FREEWAY_METRIC,
        (RoadClass::Freeway, _) => &FREEWAY,
    }
}

/// The default maximum grade (percent) and the rule that gave it, for a road
/// class, area, terrain and design speed.
///
/// Each table is used in its own units: a metric project reads the metric
/// edition's rows in km/h, a US customary one the US rows in mph (the
/// editions' columns are not conversions of each other: 100 km/h on a
/// mountainous freeway is 6 % in the metric table, while its 62 mph would
/// read 5 % in the US one). A speed between two columns takes the higher,
/// stricter column; a speed outside the table takes its nearest end, and
/// the rule says so. The usual allowances — about 1 % steeper for short
/// grades (under 500 ft or 150 m) and one-way downgrades, and on urban
/// freeways — are named in the rule and entered as an override (from
/// memory).
pub fn max_grade(units: Units, speed: f64, class: RoadClass, area: Area, terrain: Terrain) -> (f64, String) {
    let table = table(class, area, units);
    let unit = units.speed_symbol();
    let speeds = table.speeds;
    let grades = table.grades.get(terrain.row()).copied().unwrap_or(&[]);
    let column =
        speeds.iter().position(|&s| crate::tolerance::meets(s, crate::tolerance::Bound::AtLeast(speed)));
    let (lowest, highest) = (speeds.first().copied().unwrap_or(0.0), speeds.last().copied().unwrap_or(0.0));
    let mut note = String::new();
    if speeds.len() > 1 {
        match column {
            Some(0) if crate::tolerance::below(speed, lowest) => {
                note.push_str(&format!("; table starts at {lowest} {unit}, its value used"));
            }
            None => note.push_str(&format!("; table ends at {highest} {unit}, its value used")),
            Some(i) if speeds.get(i).is_some_and(|s| crate::tolerance::above(*s, speed)) => {
                note.push_str(&format!(
                    "; between columns, the stricter {} {unit} used",
                    speeds.get(i).copied().unwrap_or(0.0)
                ));
            }
            _ => {}
        }
    }
    let column = column.unwrap_or(speeds.len().saturating_sub(1));
    let grade = grades.get(column).copied().unwrap_or(f64::NAN);
    let allowance = if class == RoadClass::Freeway && area == Area::Urban {
        "; urban freeways may be about 1 % steeper"
    } else {
        ""
    };
    let rule = format!(
        "Green Book 2018 {}, {} terrain (from memory){note}{allowance}; short grades and one-way downgrades \
         may be about 1 % steeper: enter an override",
        table.name,
        terrain.label()
    );
    (grade, rule)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_table_is_rectangular() {
        for t in [
            &RURAL_LOCAL,
            &RURAL_LOCAL_METRIC,
            &URBAN_LOCAL,
            &URBAN_LOCAL_METRIC,
            &RURAL_COLLECTOR,
            &RURAL_COLLECTOR_METRIC,
            &URBAN_COLLECTOR,
            &URBAN_COLLECTOR_METRIC,
            &RURAL_ARTERIAL,
            &RURAL_ARTERIAL_METRIC,
            &URBAN_ARTERIAL,
            &URBAN_ARTERIAL_METRIC,
            &FREEWAY,
            &FREEWAY_METRIC,
        ] {
            for row in t.grades {
                assert_eq!(row.len(), t.speeds.len(), "{}", t.name);
            }
        }
    }
}

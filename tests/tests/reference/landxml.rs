//! LandXML 1.2 interchange (the open standard's schema, `tests/data/LandXML-1.2.xsd`):
//! exported files validate against the schema, a round trip gives back the
//! profile and the ground, and a hand-written file reads as the published
//! curve formulas say.

use std::path::{Path, PathBuf};

use gradewright_acceptance::assert_close;
use gradewright_document::Project;
use gradewright_exchange::{FileLengths, NoteKind, Selection, Stamp, read_landxml, write_landxml};
use gradewright_geometry::{Alignment, Foot, GroundPoint, Profile, Pvi, Station, Units, VerticalCurve};

fn schema() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("data/LandXML-1.2.xsd")
}

fn stamp() -> Stamp {
    Stamp { date: "2026-12-03".to_owned(), time: "10:00:00".to_owned() }
}

/// The test project; its name holds spaces, so its design speed goes in a
/// `Feature` of the alignment ([`named`] gives one a `Roadway` can refer to).
fn project(units: Units, foot: Foot, ground: bool) -> Project {
    let mut p = Project::new("Quarry Spur & Mill <east>", units);
    p.foot = foot;
    p.criteria.design_speed = Some(if units == Units::Metric { 80.0 } else { 50.0 });
    p.pvis = vec![
        Pvi::new(120.0, 150.25),
        Pvi::with_curve(420.0, 156.5, 140.0),
        Pvi {
            curve: VerticalCurve::Unequal { length_in: 80.0, length_out: 130.0 },
            ..Pvi::new(780.0, 149.125)
        },
        Pvi::new(1100.0, 152.0),
    ];
    if ground {
        p.ground = (0..=120)
            .map(|i| {
                let s = 100.0 + 10.0 * f64::from(i);
                GroundPoint { station: s, elevation: 150.0 + 3.0 * (s / 97.0).sin() }
            })
            .collect::<Vec<_>>()
            .into();
    }
    p
}

/// `p` renamed to a name without spaces (its design speed in a `Roadway`).
fn named(mut p: Project, name: &str) -> Project {
    p.name = name.to_owned();
    p
}

fn xml(p: &Project) -> Vec<u8> {
    let mut out = Vec::new();
    write_landxml(&mut out, p, &stamp()).unwrap_or_else(|e| panic!("{e}"));
    out
}

/// Every export validates against the LandXML 1.2 schema (xmllint from
/// libxml2-utils; `.ci/run` installs it): metres, international feet and US
/// survey feet, with and without ground, with an unequal-tangent curve, the
/// design speed in a `Roadway` and in a `Feature`, and with none.
#[test]
fn exports_validate_against_the_landxml_schema() {
    let dir = std::env::temp_dir().join(format!("gradewright-landxml-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let mut count = 0;
    for (units, foot) in [
        (Units::Metric, Foot::International),
        (Units::UsCustomary, Foot::International),
        (Units::UsCustomary, Foot::UsSurvey),
    ] {
        for (ground, speed) in [(false, "feature"), (true, "roadway"), (true, "none")] {
            let p = match speed {
                "roadway" => named(project(units, foot, ground), "Quarry_Spur"),
                "none" => {
                    let mut p = project(units, foot, ground);
                    p.criteria.design_speed = None;
                    p
                }
                _ => project(units, foot, ground),
            };
            let text = xml(&p);
            let written = String::from_utf8_lossy(&text);
            assert_eq!(written.contains("<Roadways>"), speed == "roadway", "{written}");
            assert_eq!(written.contains(r#"label="designSpeed""#), speed == "feature", "{written}");
            let path = dir.join(format!("{}-{foot:?}-{ground}-{speed}.xml", units.key()));
            std::fs::write(&path, &text).unwrap_or_else(|e| panic!("{e}"));
            let run = std::process::Command::new("xmllint")
                .arg("--noout")
                .arg("--schema")
                .arg(schema())
                .arg(&path)
                .output()
                .unwrap_or_else(|e| panic!("xmllint (from libxml2-utils) is needed for this test: {e}"));
            let said = String::from_utf8_lossy(&run.stderr);
            assert!(run.status.success(), "{}: {said}", path.display());
            assert!(said.contains("validates"), "{said}");
            count += 1;
        }
    }
    assert_eq!(count, 9);
    // The check can fail: a ProfAlign without its required name does not validate.
    let bad = dir.join("no-name.xml");
    let text =
        String::from_utf8_lossy(&xml(&project(Units::Metric, Foot::International, false))).into_owned();
    std::fs::write(&bad, text.replace(r#"<ProfAlign name="Proposed">"#, "<ProfAlign>"))
        .unwrap_or_else(|e| panic!("{e}"));
    let run =
        std::process::Command::new("xmllint").arg("--noout").arg("--schema").arg(schema()).arg(&bad).output();
    assert!(run.is_ok_and(|r| !r.status.success()), "a ProfAlign without a name validated");
}

/// Export then import gives back the stations, elevations, curve lengths and
/// ground to the printed precision (six decimals), in each unit.
#[test]
fn a_round_trip_gives_back_the_profile_and_the_ground() {
    for (units, foot) in [(Units::Metric, Foot::International), (Units::UsCustomary, Foot::UsSurvey)] {
        let p = project(units, foot, true);
        let read = read_landxml(xml(&p).as_slice(), Path::new("round.xml"), &Selection::default(), None)
            .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!((read.units, read.foot), (units, foot));
        assert_eq!(read.alignment, p.name);
        assert_eq!(read.pvis.len(), p.pvis.len());
        for (a, b) in read.pvis.iter().zip(&p.pvis) {
            assert_close(a.station.0, b.station.0, 1e-6, "station");
            assert_close(a.elevation, b.elevation, 1e-6, "elevation");
            assert_close(a.curve.length_in(), b.curve.length_in(), 1e-6, "length in");
            assert_close(a.curve.length_out(), b.curve.length_out(), 1e-6, "length out");
        }
        assert!(matches!(read.pvis[2].curve, VerticalCurve::Unequal { .. }));
        assert_eq!(read.design_speed, p.criteria.design_speed, "design speed in a Feature");
        assert_eq!(read.project().criteria.design_speed, p.criteria.design_speed);
        assert_eq!(read.ground.len(), p.ground.len());
        for (a, b) in read.ground.iter().zip(p.ground.iter()) {
            assert_close(a.station, b.station, 1e-6, "ground station");
            assert_close(a.elevation, b.elevation, 1e-6, "ground elevation");
        }
    }
}

/// The design speed is written where LandXML 1.2 puts it (`Roadway`/
/// `Speeds`/`DesignSpeed@speed`, km/h for Metric files and mph for
/// Imperial ones, as the schema's `speed` type says) and read back, in the
/// file's units or converted (1 mi = 1.609344 km exactly, the international
/// mile); a file with none opens with none, and the reader says what it read.
#[test]
fn the_design_speed_goes_in_the_roadway_and_comes_back() {
    let metric = named(project(Units::Metric, Foot::International, false), "Quarry_Spur");
    let text = xml(&metric);
    let written = String::from_utf8_lossy(&text);
    assert!(
        written.contains(r#"<Roadway name="Quarry_Spur" alignmentRefs="Quarry_Spur">"#)
            && written.contains(r#"<DesignSpeed staStart="120" staEnd="1100" speed="80"/>"#),
        "{written}"
    );
    let read = read_landxml(text.as_slice(), Path::new("r.xml"), &Selection::default(), None)
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(read.design_speed, Some(80.0));
    assert!(read.notes.iter().any(|n| n.to_string().contains("design speed 80 km/h read from the file")));
    // Into US customary: 80 km/h is 49.709... mph.
    let us =
        read_landxml(text.as_slice(), Path::new("r.xml"), &Selection::default(), Some(Units::UsCustomary))
            .unwrap_or_else(|e| panic!("{e}"));
    assert_close(us.design_speed.unwrap_or(f64::NAN), 80.0 / 1.609_344, 1e-12, "80 km/h in mph");
    assert!(
        us.notes
            .iter()
            .any(|n| n.to_string().contains("design speed 80 km/h read from the file (49.71 mph)")),
        "{:?}",
        us.notes.iter().map(ToString::to_string).collect::<Vec<_>>()
    );
    // An Imperial file read into metric: 50 mph is 80.4672 km/h.
    let imperial = xml(&named(project(Units::UsCustomary, Foot::International, false), "Quarry_Spur"));
    let m = read_landxml(imperial.as_slice(), Path::new("i.xml"), &Selection::default(), Some(Units::Metric))
        .unwrap_or_else(|e| panic!("{e}"));
    assert_close(m.design_speed.unwrap_or(f64::NAN), 80.4672, 1e-9, "50 mph in km/h");
    // A file with no design speed opens with none (its checks then say so).
    let mut none = metric.clone();
    none.criteria.design_speed = None;
    let read = read_landxml(xml(&none).as_slice(), Path::new("n.xml"), &Selection::default(), None)
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!((read.design_speed, read.project().criteria.design_speed), (None, None));
    // A Roadway of another alignment is not this alignment's speed.
    let other =
        String::from_utf8_lossy(&text).replace(r#"alignmentRefs="Quarry_Spur""#, r#"alignmentRefs="Other""#);
    let read = read_landxml(other.as_bytes(), Path::new("o.xml"), &Selection::default(), None)
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(read.design_speed, None);
    // A speed that is no speed is an error naming the element.
    let bad = String::from_utf8_lossy(&text).replace(r#"speed="80""#, r#"speed="-5""#);
    let err = read_landxml(bad.as_bytes(), Path::new("b.xml"), &Selection::default(), None)
        .err()
        .map(|e| e.to_string())
        .unwrap_or_default();
    assert!(err.contains("b.xml") && err.contains("DesignSpeed@speed") && err.contains("-5"), "{err}");
}

/// A hand-written file in US survey feet: a crest at PVI 32+00.00, 842.60 ft,
/// +3.0 % / −2.0 %, L = 400 ft (the worked crest of `curve_relations`), then
/// an unequal-tangent sag of our own (lengthIn 200, lengthOut 300, to
/// +2.0 %), evaluated against hand-computed elevations and the
/// unequal-tangent relations (both derived from the parabola relations in
/// Mannering & Washburn ch. 3).
#[test]
fn a_hand_written_file_reads_as_the_published_curves() {
    let text = r#"<?xml version="1.0" encoding="UTF-8"?>
<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2" date="2026-12-03" time="09:00:00">
  <Units><Imperial linearUnit="USSurveyFoot" areaUnit="squareFoot" volumeUnit="cubicYard" temperatureUnit="fahrenheit" pressureUnit="inHG"/></Units>
  <Alignments>
    <Alignment name="Worked example" staStart="2600" length="1800">
      <CoordGeom><Line><Start>0 0</Start><End>1800 0</End></Line></CoordGeom>
      <Profile name="Profiles">
        <ProfAlign name="Finished grade">
          <PVI>2600.0 824.60</PVI>
          <ParaCurve length="400.0">3200.0 842.60</ParaCurve>
          <UnsymParaCurve lengthIn="200.0" lengthOut="300.0">3800.0 830.60</UnsymParaCurve>
          <PVI>4400.0 842.60</PVI>
          <Feature name="note"/>
        </ProfAlign>
      </Profile>
    </Alignment>
  </Alignments>
</LandXML>
"#;
    let read = read_landxml(text.as_bytes(), Path::new("hand.xml"), &Selection::default(), None)
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!((read.units, read.foot), (Units::UsCustomary, Foot::UsSurvey));
    assert_eq!(read.lines, vec![9, 10, 11, 12]);
    assert!(
        read.notes.iter().any(|n| matches!(&n.kind, NoteKind::Skipped { elements, .. } if elements.iter().any(|e| e == "Feature"))),
        "{:?}",
        read.notes
    );
    let a = Alignment::new(&Profile::new(read.units, read.pvis)).unwrap_or_else(|e| panic!("{e:?}"));
    // The crest, hand-computed: PVC 30+00 836.600 … PVT 34+00 838.600.
    for (station, elevation) in
        [(3000.0, 836.6), (3100.0, 838.975), (3200.0, 840.1), (3300.0, 839.975), (3400.0, 838.6)]
    {
        let s = a.sample(Station(station)).unwrap_or_else(|e| panic!("{e}"));
        assert_close(s.elevation, elevation, 1e-9, "elevation (derived)");
    }
    // Unequal tangents: e = l1·l2·(g2 − g1)/(2L) at the PVI (derived).
    let (g1, g2, l1, l2) = (-0.02, 0.02, 200.0, 300.0);
    let e = l1 * l2 * (g2 - g1) / (2.0 * (l1 + l2));
    let at_pvi = a.sample(Station(3800.0)).unwrap_or_else(|e| panic!("{e}"));
    assert_close(at_pvi.elevation, 830.6 + e, 1e-9, "elevation at the PVI (derived)");
    let x = 120.0;
    let s = a.sample(Station(3600.0 + x)).unwrap_or_else(|e| panic!("{e}"));
    assert_close(
        s.elevation,
        830.6 - g1 * l1 + g1 * x + e * (x / l1).powi(2),
        1e-9,
        "first branch (derived)",
    );
}

/// Several alignments and profiles: the choice is by name, and an ambiguous
/// or unknown choice lists the names.
#[test]
fn several_alignments_are_chosen_by_name() {
    let one = String::from_utf8_lossy(&xml(&project(Units::Metric, Foot::International, true))).into_owned();
    let alignment_of = |text: &str| {
        let start = text.find("<Alignment ").unwrap_or(0);
        let end = text.find("</Alignment>").map_or(0, |e| e + "</Alignment>".len());
        text[start..end].to_owned()
    };
    let first = alignment_of(&one);
    let second = first.replace("Quarry Spur &amp; Mill &lt;east&gt;", "Ridge Lane").replace("156.5", "158.5");
    let two = one.replace(&first, &format!("{first}\n{second}"));
    let path = Path::new("two.xml");
    let read = |selection: Selection| read_landxml(two.as_bytes(), path, &selection, None);
    let err = read(Selection::default()).err().map(|e| e.to_string()).unwrap_or_default();
    assert!(err.contains("2 design profiles") && err.contains("'Ridge Lane / Proposed'"), "{err}");
    let ridge = read(Selection { alignment: Some("Ridge Lane".to_owned()), ..Selection::default() })
        .unwrap_or_else(|e| panic!("{e}"));
    assert_close(ridge.pvis[1].elevation, 158.5, 1e-12, "the chosen alignment's PVI");
    let err = read(Selection { alignment: Some("Nope".to_owned()), ..Selection::default() })
        .err()
        .map(|e| e.to_string())
        .unwrap_or_default();
    assert!(err.contains("no alignment named 'Nope'") && err.contains("'Ridge Lane'"), "{err}");
    // Asked for other units, every length is converted and a note says so.
    let feet = read_landxml(one.as_bytes(), path, &Selection::default(), Some(Units::UsCustomary))
        .unwrap_or_else(|e| panic!("{e}"));
    assert_close(feet.pvis[1].elevation, 156.5 / 0.3048, 1e-9, "converted elevation (0.3048 m per ft)");
    assert!(
        feet.notes.iter().any(|n| matches!(n.kind, NoteKind::Converted { from: FileLengths::Metres, .. })),
        "{:?}",
        feet.notes
    );
}

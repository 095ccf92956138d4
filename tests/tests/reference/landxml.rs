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

fn project(units: Units, foot: Foot, ground: bool) -> Project {
    let mut p = Project::new("Quarry Spur & Mill <east>", units);
    p.foot = foot;
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

fn xml(p: &Project) -> Vec<u8> {
    let mut out = Vec::new();
    write_landxml(&mut out, p, &stamp()).unwrap_or_else(|e| panic!("{e}"));
    out
}

/// Every export validates against the LandXML 1.2 schema (xmllint from
/// libxml2-utils; `.ci/run` installs it): metres, international feet and US
/// survey feet, with and without ground, with an unequal-tangent curve.
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
        for ground in [false, true] {
            let path = dir.join(format!("{}-{foot:?}-{ground}.xml", units.key()));
            std::fs::write(&path, xml(&project(units, foot, ground))).unwrap_or_else(|e| panic!("{e}"));
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
    assert_eq!(count, 6);
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
        assert_eq!(read.ground.len(), p.ground.len());
        for (a, b) in read.ground.iter().zip(p.ground.iter()) {
            assert_close(a.station, b.station, 1e-6, "ground station");
            assert_close(a.elevation, b.elevation, 1e-6, "ground elevation");
        }
    }
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

//! A whole field log typed from the keyboard in the bed table's entry row, with no mouse: every
//! key press counted, every bed checked field by field, and the interpretation of the result;
//! Enter adds on top after a bed lower down was edited; typing right after a Tab in one frame
//! lands in the next cell; a bed split at a chosen height.

use super::harness::{app_with as app, harness_of as harness};
use aggrade::gui::test_hooks::INVALID;
use aggrade::gui::{AggradeApp, Document};
use aggrade_core::model::{
    BedId, Contact, GrainSize, Lithology, PaleosolDevelopment as Dev, PaleosolFeature as Pf, Project,
    Section, Structure as St, SurfaceKind, WentworthClass as W,
};
use aggrade_core::rules::CandidateKind;
use egui::{Event, Key, Modifiers};
use egui_kittest::kittest::{NodeT, Queryable};
use egui_kittest::Harness;

/// The window on an empty section, driven by key presses that are counted.
struct Typist {
    h: Harness<'static, AggradeApp>,
    /// Key presses so far: a character of text is one, Tab or Enter is one.
    keys: usize,
}

impl Typist {
    fn new() -> (Self, tempfile::TempDir) {
        let data = tempfile::tempdir().expect("temp dir");
        let mut a = app(None, data.path(), vec![]);
        a.doc = Document::new(Project::new(vec![Section::new("Keyboard log")]), None);
        let mut h = harness(a);
        h.run();
        (Typist { h, keys: 0 }, data)
    }

    /// Type text one character per frame, as a typist does: as a window system reports it, the
    /// key's press, its text, then its release.
    fn text(&mut self, text: &str) {
        for c in text.chars() {
            let key = Key::from_name(&c.to_uppercase().to_string());
            let event = |pressed| {
                key.map(|key| Event::Key {
                    key,
                    physical_key: None,
                    pressed,
                    repeat: false,
                    modifiers: Modifiers::NONE,
                })
            };
            self.h
                .input_mut()
                .events
                .extend(event(true).into_iter().chain([Event::Text(c.to_string())]).chain(event(false)));
            self.h.step();
            self.keys += 1;
        }
    }

    /// Press and release a key (a frame each).
    fn key(&mut self, key: Key) {
        self.h.key_press(key);
        self.h.step();
        self.keys += 1;
    }

    /// Press a key with modifiers held (counted as one press, as a shortcut is).
    fn chord(&mut self, modifiers: Modifiers, key: Key) {
        self.h.key_press_modifiers(modifiers, key);
        self.h.step();
        self.keys += 1;
    }

    /// One bed: its cells in Tab order (empty cells are skipped with a Tab), then Enter.
    fn bed(&mut self, cells: &[&str]) {
        for (k, cell) in cells.iter().enumerate() {
            if k > 0 {
                self.key(Key::Tab);
            }
            self.text(cell);
        }
        self.key(Key::Enter);
        self.h.run();
    }

    fn section(&self) -> &Section {
        self.h.state().doc.section()
    }
}

/// The log of the issue (invented), base to top, in the entry row's cells: thickness,
/// lithology, grain, paleosol, structures, contact, paleocurrents, surface. An empty lithology
/// is named by the grain size (sandstone, conglomerate, mudstone); a covered top is `c` and its
/// thickness.
const LOG: [&[&str]; 13] = [
    &["2.4", "", "cl", "m rt"],
    &[".6", "si", "si", "", "rcl"],
    &["1.8", "", "cl", "s cn"],
    &[".4", "", "pbl", "", "bl", "e1.2", "210 225", "RG-E1"],
    &["2.1", "", "c-m", "", "tcb", "", "200 215 230"],
    &["1.9", "", "m-f", "", "tcb", "e"],
    &["1.5", "", "f", "", "pcb", "", "240"],
    &["3.2", "", "cl", "w rt"],
    &[".5", "", "vf", "", "rcl"],
    &["4", "", "cl", "m"],
    &["1.6", "", "m-f", "", "la", "e"],
    &["5", "", "cl", "w"],
    &["4.5 c2", "", "si"],
];

/// One bed as the log says it, in full words.
#[derive(Debug, PartialEq)]
struct Logged {
    thickness_m: f64,
    lithology: Lithology,
    grain: (Option<GrainSize>, Option<GrainSize>),
    structures: Vec<St>,
    contact: Contact,
    relief_m: Option<f64>,
    paleosol: Dev,
    features: Vec<Pf>,
    paleocurrents: Vec<f64>,
}

fn logged(
    thickness_m: f64,
    lithology: Lithology,
    grain: (Option<W>, Option<W>),
    structures: &[St],
    (contact, relief_m): (Contact, Option<f64>),
    (paleosol, features): (Dev, &[Pf]),
    paleocurrents: &[f64],
) -> Logged {
    Logged {
        thickness_m,
        lithology,
        grain: (grain.0.map(GrainSize::Class), grain.1.map(GrainSize::Class)),
        structures: structures.to_vec(),
        contact,
        relief_m,
        paleosol,
        features: features.to_vec(),
        paleocurrents: paleocurrents.to_vec(),
    }
}

#[test]
fn a_thirteen_bed_field_log_is_typed_with_no_mouse_and_reads_bed_by_bed() {
    let (mut t, _data) = Typist::new();
    // Nothing has the focus: the first digit starts the entry row.
    for cells in LOG {
        t.bed(cells);
    }
    let keys = t.keys;
    println!("keystrokes for the 13-bed log, every field of every bed: {keys}");
    use Lithology::{Conglomerate, Covered, Mudstone, Sandstone, Siltstone};
    let sharp = (Contact::Sharp, None);
    let eros = (Contact::Erosional, None);
    let no_soil: (Dev, &[Pf]) = (Dev::None, &[]);
    let one = |c| (Some(c), Some(c));
    let want = vec![
        logged(2.4, Mudstone, one(W::Clay), &[], sharp, (Dev::Moderate, &[Pf::RootTraces]), &[]),
        logged(0.6, Siltstone, one(W::Silt), &[St::RippleCrossLamination], sharp, no_soil, &[]),
        logged(1.8, Mudstone, one(W::Clay), &[], sharp, (Dev::Strong, &[Pf::CarbonateNodules]), &[]),
        logged(
            0.4,
            Conglomerate,
            one(W::Pebble),
            &[St::BasalLag],
            (Contact::Erosional, Some(1.2)),
            no_soil,
            &[210.0, 225.0],
        ),
        logged(
            2.1,
            Sandstone,
            (Some(W::CoarseSand), Some(W::MediumSand)),
            &[St::TroughCrossBedding],
            sharp,
            no_soil,
            &[200.0, 215.0, 230.0],
        ),
        logged(
            1.9,
            Sandstone,
            (Some(W::MediumSand), Some(W::FineSand)),
            &[St::TroughCrossBedding],
            eros,
            no_soil,
            &[],
        ),
        logged(1.5, Sandstone, one(W::FineSand), &[St::PlanarCrossBedding], sharp, no_soil, &[240.0]),
        logged(3.2, Mudstone, one(W::Clay), &[], sharp, (Dev::Weak, &[Pf::RootTraces]), &[]),
        logged(0.5, Sandstone, one(W::VeryFineSand), &[St::RippleCrossLamination], sharp, no_soil, &[]),
        logged(4.0, Mudstone, one(W::Clay), &[], sharp, (Dev::Moderate, &[]), &[]),
        logged(
            1.6,
            Sandstone,
            (Some(W::MediumSand), Some(W::FineSand)),
            &[St::LateralAccretion],
            eros,
            no_soil,
            &[],
        ),
        logged(5.0, Mudstone, one(W::Clay), &[], sharp, (Dev::Weak, &[]), &[]),
        // 4.5 m of mudstone (silt) whose top 2 m are covered: 2.5 m exposed, 2 m covered.
        logged(2.5, Mudstone, one(W::Silt), &[], sharp, no_soil, &[]),
        logged(2.0, Covered, (None, None), &[], sharp, no_soil, &[]),
    ];
    let beds = t.section().beds.clone();
    assert_eq!(beds.len(), want.len(), "13 beds and the covered top: {beds:#?}");
    for (i, (b, w)) in beds.iter().zip(&want).enumerate() {
        let got = Logged {
            thickness_m: b.thickness_m,
            lithology: b.lithology,
            grain: (b.grain_base, b.grain_top),
            structures: b.structures.clone(),
            contact: b.base_contact,
            relief_m: b.base_relief_m,
            paleosol: b.paleosol,
            features: b.paleosol_features.clone(),
            paleocurrents: b.azimuths().collect(),
        };
        assert!((got.thickness_m - w.thickness_m).abs() < 1e-9, "bed {}: {got:?}", i + 1);
        assert_eq!(Logged { thickness_m: w.thickness_m, ..got }, *w, "bed {}", i + 1);
    }
    // The surface at the conglomerate's erosional base, an incision surface by its contact.
    let named: Vec<(usize, &str, SurfaceKind)> = beds
        .iter()
        .enumerate()
        .filter_map(|(i, b)| b.base_surface.as_ref().map(|s| (i, s.name.as_str(), s.kind)))
        .collect();
    assert_eq!(named, [(3, "RG-E1", SurfaceKind::Incision)]);
    assert!((t.section().total_thickness_m() - 29.5).abs() < 1e-9, "the log's 29.5 m");

    // The interpretation finds the channel body, from the conglomerate's base at 4.8 m to the
    // planar cross-bedded sandstone's top at 10.7 m, and the erosional surface at its base.
    let interp = t.h.state_mut().interpretation().clone();
    let body = interp
        .channel_bodies
        .iter()
        .find(|c| (c.base_m - 4.8).abs() < 1e-9)
        .unwrap_or_else(|| panic!("no channel body based at 4.8 m: {:#?}", interp.channel_bodies));
    assert!((body.top_m - 10.7).abs() < 1e-9, "{body:?}");
    let base = interp.sequence_boundary_candidates.iter().find(|c| c.bed_index == 3).unwrap_or_else(|| {
        panic!("no candidate at the conglomerate's base: {:#?}", interp.sequence_boundary_candidates)
    });
    assert!(
        matches!(base.kind, CandidateKind::ChannelBodyBase | CandidateKind::ChannelBaseOnPaleosol),
        "{base:?}"
    );
    assert_eq!(base.surface_name.as_deref(), Some("RG-E1"));
    assert!(keys < 200, "{keys} keystrokes");
}

#[test]
fn enter_adds_on_top_after_a_bed_lower_down_was_edited_and_ctrl_enter_inserts_above_it() {
    let (mut t, _data) = Typist::new();
    t.bed(&["1", "", "cl"]);
    t.bed(&["2", "", "f"]);
    t.bed(&["3", "", "cl"]);
    let ids: Vec<BedId> = t.section().beds.iter().map(|b| b.id).collect();
    // Fix the lowest bed from the keyboard: leave the row, select it, F2, change its grain.
    t.key(Key::Escape);
    for _ in 0..2 {
        t.key(Key::ArrowDown);
    }
    assert_eq!(t.h.state().doc.selected_bed, Some(ids[0]), "the arrows select the lowest bed");
    t.key(Key::F2);
    t.key(Key::Tab);
    t.key(Key::Tab);
    t.text("si");
    t.key(Key::Enter);
    t.h.run();
    let beds = t.section().beds.clone();
    assert_eq!(beds[0].grain_base, Some(GrainSize::Class(W::Silt)), "the edit is stored");
    assert_eq!(beds.iter().map(|b| b.id).collect::<Vec<_>>(), ids, "an edit adds no bed");
    // The next bed typed goes on top, although a bed lower down was the one selected.
    t.bed(&["4", "", "m"]);
    let beds = t.section().beds.clone();
    assert_eq!(beds.len(), 4);
    assert_eq!((beds[3].thickness_m, beds[3].lithology), (4.0, Lithology::Sandstone));
    assert_eq!(&beds.iter().map(|b| b.id).collect::<Vec<_>>()[..3], &ids[..], "bed numbers below keep");
    // Ctrl+Enter inserts above the selection instead: select bed 1 again, type, Ctrl+Enter.
    t.key(Key::Escape);
    for _ in 0..3 {
        t.key(Key::ArrowDown);
    }
    assert_eq!(t.h.state().doc.selected_bed, Some(ids[0]));
    t.text("0.5");
    t.key(Key::Tab);
    t.key(Key::Tab);
    t.text("vf");
    t.chord(Modifiers::COMMAND, Key::Enter);
    t.h.run();
    let beds = t.section().beds.clone();
    assert_eq!(beds.len(), 5);
    assert_eq!((beds[1].thickness_m, beds[1].lithology), (0.5, Lithology::Sandstone), "inserted above bed 1");
    // An edit that is cancelled leaves the bed as it was.
    t.key(Key::Escape);
    t.key(Key::F2);
    t.text("9");
    t.key(Key::Escape);
    t.h.run();
    assert_eq!(t.section().beds[1].thickness_m, 0.5, "Esc dropped the edit");
}

#[test]
fn typing_right_after_a_tab_in_the_same_frame_lands_in_the_next_cell() {
    let (mut t, _data) = Typist::new();
    let key = |k: Key, pressed: bool| Event::Key {
        key: k,
        physical_key: None,
        pressed,
        repeat: false,
        modifiers: Modifiers::NONE,
    };
    // A fast typist: each Tab arrives in the same frame as the letters after it, and a whole
    // bed in one frame after that.
    let frames: Vec<Vec<Event>> = vec![
        vec![Event::Text("1".into())],
        vec![key(Key::Tab, true), key(Key::Tab, false), Event::Text("mu".into())],
        vec![key(Key::Tab, true), key(Key::Tab, false), Event::Text("cl".into()), key(Key::Enter, true)],
        vec![
            Event::Text("2".into()),
            key(Key::Tab, true),
            Event::Text("sa".into()),
            key(Key::Tab, true),
            Event::Text("m".into()),
            key(Key::Tab, true),
            key(Key::Tab, true),
            Event::Text("tcb".into()),
            key(Key::Enter, true),
        ],
    ];
    for events in frames {
        t.h.input_mut().events.extend(events);
        t.h.step();
    }
    // The typing held back after each Tab and Enter takes a frame a key.
    t.h.run_steps(12);
    let beds: Vec<(f64, Lithology, Option<GrainSize>, Vec<St>)> = t
        .section()
        .beds
        .iter()
        .map(|b| (b.thickness_m, b.lithology, b.grain_base, b.structures.clone()))
        .collect();
    assert_eq!(
        beds,
        vec![
            (1.0, Lithology::Mudstone, Some(GrainSize::Class(W::Clay)), vec![]),
            (2.0, Lithology::Sandstone, Some(GrainSize::Class(W::MediumSand)), vec![St::TroughCrossBedding]),
        ],
        "no letter typed after a Tab stayed in the cell being left"
    );
}

#[test]
fn a_cell_that_does_not_read_is_marked_and_named_and_nothing_is_added() {
    let (mut t, _data) = Typist::new();
    t.bed(&["1.2", "", "m", "", "zz"]);
    assert!(t.section().beds.is_empty(), "a bed with a bad cell is not added");
    let framed = t.h.output().shapes.iter().any(
        |c| matches!(&c.shape, egui::Shape::Rect(r) if r.stroke.color == INVALID && r.stroke.width > 0.0),
    );
    assert!(framed, "the structures cell is framed");
    let message =
        t.h.query_all_by(|n| {
            n.label().or_else(|| n.value()).is_some_and(|l| l.starts_with("structures: \"zz\""))
        })
        .next()
        .and_then(|n| n.accesskit_node().label().or_else(|| n.value()))
        .expect("the message names the cell");
    assert!(message.contains("trough cross-bedding (tcb)"), "{message}");
    // The focus is in the cell at fault: fix it and press Enter.
    assert_eq!(t.h.get_by(|n| n.is_focused()).value().as_deref(), Some("zz"));
    t.text("la");
    t.key(Key::Enter);
    t.h.run();
    let beds = t.section().beds.clone();
    assert_eq!(beds.len(), 1);
    assert_eq!(beds[0].structures, vec![St::LateralAccretion], "typing replaced the selected text");
}

#[test]
fn a_bed_is_split_at_a_chosen_height_half_by_default() {
    let (mut t, _data) = Typist::new();
    t.bed(&["1.9", "", "m-f"]);
    let id = t.section().beds[0].id;
    t.h.state_mut().doc.selected_bed = Some(id);
    t.h.run();
    // The row's menu: right-click, "Split at…", the height, Enter.
    let row = t.h.state().table_rows_shown();
    assert_eq!(row, 0..1);
    t.h.get_by(|n| n.label().is_some_and(|l| l.starts_with("Bed 1: 1.9 m sandstone"))).click_secondary();
    t.h.run();
    t.h.get_by_label("Split at…").click();
    t.h.run();
    let field =
        t.h.get_by(|n| n.role() == egui::accesskit::Role::TextInput && n.value().as_deref() == Some("0.95"));
    field.focus();
    t.h.run();
    t.h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    t.h.run();
    t.h.get_by(|n| n.is_focused()).type_text("0.6");
    t.h.run();
    t.h.key_press(Key::Enter);
    t.h.run();
    let parts: Vec<f64> = t.section().beds.iter().map(|b| b.thickness_m).collect();
    assert_eq!(parts.len(), 2, "{parts:?}");
    assert!((parts[0] - 0.6).abs() < 1e-12 && (parts[1] - 1.3).abs() < 1e-12, "{parts:?}");
}

//! Speed of the interface's edit loop: one nudge (validate, re-solve the
//! balance, rebuild the table) and one full render of the Balance view at
//! 160×48 to a test backend. Target: under 8 ms in release (half a 60 Hz
//! frame budget and then some, on a 2-core machine).

use criterion::{criterion_group, criterion_main, Criterion};
use ratatui::backend::TestBackend;
use ratatui::crossterm::event::{Event, KeyCode, KeyEvent, KeyModifiers};
use ratatui::Terminal;
use spinwright::catalogue::DEFLECTION;
use spinwright::tui::fields::Field;
use spinwright::tui::{draw, App};
use std::hint::black_box;

fn key(code: KeyCode) -> Event {
    Event::Key(KeyEvent::new(code, KeyModifiers::NONE))
}

fn edit_and_render(c: &mut Criterion) {
    let mut app = App::open(None).expect("the built-in example opens");
    app.event(&Event::Resize(160, 48));
    // The example opens with its arms together: one deflection for all arms.
    let deflection = [Field::of(&DEFLECTION), Field::on_arm(&DEFLECTION, 0)];
    for _ in 0..400 {
        if app
            .selected_field()
            .is_some_and(|f| deflection.contains(&f))
        {
            break;
        }
        app.event(&key(KeyCode::Down));
    }
    assert!(
        app.selected_field()
            .is_some_and(|f| deflection.contains(&f)),
        "the deflection field is in the list"
    );
    let mut term = Terminal::new(TestBackend::new(160, 48)).expect("test terminal");
    let mut forward = true;
    c.bench_function("nudge + re-solve + render Balance 160x48", |b| {
        b.iter(|| {
            // Alternate so the design stays near where it started.
            app.event(&key(if forward {
                KeyCode::Right
            } else {
                KeyCode::Left
            }));
            forward = !forward;
            term.draw(|f| draw(black_box(&app), f)).expect("draw");
            app.poll_worker();
        })
    });
}

criterion_group! {
    name = tui;
    config = Criterion::default().sample_size(50);
    targets = edit_and_render
}
criterion_main!(tui);

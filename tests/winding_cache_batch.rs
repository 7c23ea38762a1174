//! A batch of rolls wound side by side through the cache of wound states is the same, bit for
//! bit, as the same rolls wound one by one through it: each new roll starts its secant from the
//! first roll held, whatever the order the threads finish in, and a roll already held is not
//! wound again. (A check of the project's own bookkeeping against itself: the physics is checked
//! elsewhere.)

use rollsleuth::case;
use rollsleuth::lanes;
use rollsleuth::winding::{Cache, Options, WindInput};

#[test]
fn a_batch_winds_as_one_by_one() {
    let opt = Options {
        nodes: 61,
        ..Options::default()
    };
    let demo = |set: &str| case::load_demo(&[set.to_string()]).unwrap();
    let base = demo("lanes.count=12");
    let soft = demo("winding.tension=\"200 N/m\"");
    let nipped = demo("winding.nip=\"3 kN/m\"");
    let l = lanes::build(&base);
    let input = |c: &case::Case| (c.material.clone(), c.roll.clone(), c.winding.clone());
    let rolls = [input(&base), input(&soft), input(&nipped), input(&soft)];
    let jobs: Vec<_> = rolls
        .iter()
        .map(|(m, r, w)| (WindInput::new(m, r, w), &l, opt))
        .collect();
    let mut one_by_one = Cache::default();
    let want: Vec<_> = jobs
        .iter()
        .map(|(i, l, o)| one_by_one.wind(i, l, *o).unwrap())
        .collect();
    // empty: the first roll is wound alone, as it starts the others
    let mut batch = Cache::default();
    let got = batch.wind_all(&jobs).unwrap();
    assert_eq!(got, want);
    assert_eq!(batch.len(), 3, "the repeated roll is wound once");
    // seeded with the first roll, as a diagnosis seeds it with the measured roll
    let mut seeded = Cache::default();
    seeded.insert(&jobs[0].0, &l, opt, &want[0]);
    assert_eq!(seeded.wind_all(&jobs[1..]).unwrap(), want[1..]);
    assert_eq!(seeded.len(), 3);
}

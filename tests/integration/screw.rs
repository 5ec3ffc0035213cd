//! Integration tests: screw.
use tidewright::propulsion::screw::*;
#[test]
fn probe() {
    for (z, ae, pd, j) in [(2u32,0.30,1.4,0.8),(3,0.65,1.2,0.7),(3,0.65,0.8,0.3),(6,0.65,1.2,0.8),(6,0.65,1.4,0.5),(2,0.30,1.2,1.0)] {
        let s = BSeriesScrew::new(ScrewGeometry{blades:z,diameter:1.0,pitch:pd,area_ratio:ae}).unwrap();
        let p = s.coefficients(j, None);
        println!("B{z}-{ae} P/D {pd} J {j}: KT {:.4} 10KQ {:.4} eta {:?} J0 {:.4}", p.thrust_coefficient, 10.0*p.torque_coefficient, p.efficiency(), s.zero_thrust_advance_ratio(None));
        let (a,b) = s.reynolds_correction(j, 2.000001e6); let (c,d) = s.reynolds_correction(j, 1e7);
        println!("   dRn2e6 {a:.2e} {b:.2e}  dRn1e7 {c:.2e} {d:.2e}");
    }
}

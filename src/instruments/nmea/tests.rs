use super::*;

#[test]
fn checksum_of_hand_computed_examples() {
    // NMEA 0183 §5.2.1: the checksum is the 8-bit XOR of every character between '$' and
    // '*', written as two hex digits. Worked by hand for "GPHDT,1.0,T":
    //   G 0x47 ^ P 0x50 = 0x17; ^ H 0x48 = 0x5F; ^ D 0x44 = 0x1B; ^ T 0x54 = 0x4F;
    //   ^ , 0x2C = 0x63; ^ 1 0x31 = 0x52; ^ . 0x2E = 0x7C; ^ 0 0x30 = 0x4C;
    //   ^ , 0x2C = 0x60; ^ T 0x54 = 0x34.
    assert_eq!(checksum("GPHDT,1.0,T"), 0x34);
    // "ERRPM,E,1,0,,A": E 0x45 ^ R 0x52 = 0x17; ^ R = 0x45; ^ P 0x50 = 0x15; ^ M 0x4D = 0x58;
    //   ^ , = 0x74; ^ E = 0x31; ^ , = 0x1D; ^ 1 0x31 = 0x2C; ^ , = 0x00; ^ 0 0x30 = 0x30;
    //   ^ , = 0x1C; ^ , = 0x30; ^ A 0x41 = 0x71.
    assert_eq!(checksum("ERRPM,E,1,0,,A"), 0x71);
    assert_eq!(with_checksum("GPHDT,1.0,T"), "$GPHDT,1.0,T*34");
    // A widely quoted RMC example sentence and its published checksum *6A (NMEA 0183
    // example as printed in receiver manuals; recomputed here by the same XOR).
    let rmc = "$GPRMC,123519,A,4807.038,N,01131.000,E,022.4,084.4,230394,003.1,W*6A";
    assert!(parse_sentence(rmc).is_ok());
}

#[test]
fn rmc_gives_time_date_and_speed() {
    let rmc = "$GPRMC,123519,A,4807.038,N,01131.000,E,022.4,084.4,230394,003.1,W*6A";
    let r = parse_sentence(rmc).unwrap();
    let Reading::Fix {
        time_of_day_s,
        date_days,
        valid,
        speed_over_ground,
        course_over_ground_deg,
    } = r[0]
    else {
        panic!("{r:?}")
    };
    assert_eq!(time_of_day_s, Some(12.0 * 3600.0 + 35.0 * 60.0 + 19.0));
    assert_eq!(
        date_days,
        Some(super::super::time::days_from_civil(1994, 3, 23))
    );
    assert!(valid);
    // 22.4 kn × 1852/3600 = 11.5236 m/s (BIPM SI Brochure, Table 8: knot).
    assert!((speed_over_ground.unwrap() - 11.523_555).abs() < 1e-4);
    assert!((course_over_ground_deg.unwrap() - 84.4).abs() < 1e-4);
}

#[test]
fn hdg_applies_deviation_and_variation() {
    let s = with_checksum("HCHDG,98.3,0.0,E,12.6,W");
    assert_eq!(parse_sentence(&s).unwrap().len(), 1);
    let Reading::Heading(h) = parse_sentence(&s).unwrap()[0] else {
        panic!()
    };
    assert!((h - 85.7).abs() < 1e-9, "{h}");
    let s = with_checksum("HCHDG,5.0,,,10.0,W");
    let Reading::Heading(h) = parse_sentence(&s).unwrap()[0] else {
        panic!()
    };
    assert!((h - 355.0).abs() < 1e-9, "{h}");
}

#[test]
fn rpm_sentence_sources_and_status() {
    let r = parse_sentence(&with_checksum("ERRPM,E,2,1650.5,,A")).unwrap();
    assert_eq!(r, vec![Reading::Rpm(RpmSource::Engine(2), Some(1650.5))]);
    let r = parse_sentence(&with_checksum("ERRPM,S,1,820,,V")).unwrap();
    assert_eq!(r, vec![Reading::Rpm(RpmSource::Shaft(1), None)]);
    assert_eq!(
        parse_sentence(&with_checksum("ERRPM,X,1,820,,A")),
        Err(BadLine::BadFields)
    );
    assert_eq!(
        parse_sentence(&with_checksum("ERRPM,E,1,fast,,A")),
        Err(BadLine::BadFields)
    );
}

#[test]
fn xdr_tachometer_quadruples() {
    let r = parse_sentence(&with_checksum("IIXDR,C,19.5,C,AIR,T,1200,R,ENGINE2")).unwrap();
    assert_eq!(r, vec![Reading::Rpm(RpmSource::Engine(2), Some(1200.0))]);
    let r = parse_sentence(&with_checksum("IIXDR,T,900,R,MAIN")).unwrap();
    assert_eq!(r, vec![Reading::Rpm(RpmSource::Engine(1), Some(900.0))]);
    assert_eq!(
        parse_sentence(&with_checksum("IIXDR,T,900,R")),
        Err(BadLine::BadFields)
    );
}

#[test]
fn bad_lines_by_reason() {
    assert_eq!(parse_line(b"$GPHDT,1.0,T*35"), Err(BadLine::BadChecksum));
    assert_eq!(parse_line(b"$GPHDT,1.0,T"), Err(BadLine::MissingChecksum));
    assert_eq!(parse_line(b"$GPHDT,1.0,T*3"), Err(BadLine::MissingChecksum));
    assert_eq!(
        parse_line(with_checksum("QQHDT,1.0,T").as_bytes()),
        Err(BadLine::UnknownTalker)
    );
    assert_eq!(
        parse_line(with_checksum("GPXYZ,1.0,T").as_bytes()),
        Err(BadLine::UnknownSentence)
    );
    assert_eq!(parse_line(b"\x00\x9f\xffGP"), Err(BadLine::NotText));
    assert_eq!(parse_line(b"hello world"), Err(BadLine::NotASentence));
    assert_eq!(
        parse_line(b"12:00 $GPHDT,1.0,T*34"),
        Err(BadLine::BadTimestamp)
    );
    assert_eq!(
        parse_line(with_checksum("GPRMC,garbage").as_bytes()),
        Err(BadLine::BadFields)
    );
    // Known but unused, proprietary and AIS are valid and ignored.
    assert_eq!(
        parse_line(with_checksum("GPGSA,A,3,,,,,,,,,,,,,1.0,1.0,1.0").as_bytes())
            .unwrap()
            .readings,
        vec![]
    );
    assert_eq!(
        parse_line(with_checksum("PXYZA,1").as_bytes())
            .unwrap()
            .readings,
        vec![]
    );
}

#[test]
fn out_of_range_readings_have_their_own_reason() {
    assert_eq!(
        parse_line(with_checksum("ERRPM,E,1,-800,,A").as_bytes()),
        Err(BadLine::RpmOutOfRange)
    );
    assert_eq!(
        parse_line(with_checksum("IIXDR,T,25000,R,ENGINE1").as_bytes()),
        Err(BadLine::RpmOutOfRange)
    );
    // Flagged invalid: no reading, whatever its value.
    assert_eq!(
        parse_sentence(&with_checksum("ERRPM,E,1,-800,,V")),
        Ok(vec![Reading::Rpm(RpmSource::Engine(1), None)])
    );
    // 250 kn over ground: a GPS spike, past the 60 kn bound.
    let rmc = with_checksum("GPRMC,120000,A,4807.038,N,01131.000,E,250.0,90.0,141123,,");
    assert_eq!(parse_line(rmc.as_bytes()), Err(BadLine::SpeedOutOfRange));
    let vtg = with_checksum("GPVTG,90.0,T,,M,75.0,N,138.9,K");
    assert_eq!(parse_line(vtg.as_bytes()), Err(BadLine::SpeedOutOfRange));
}

#[test]
fn a_byte_order_mark_at_the_start_of_a_log_is_skipped() {
    let hdt = with_checksum("GPHDT,45.0,T");
    let log = format!("\u{feff}1700000000 {hdt}\n1700000001 {hdt}\n");
    let imported = read_log(log.as_bytes(), &ImportOptions::default());
    assert_eq!(imported.summary.bad_total(), 0, "{}", imported.summary);
    assert_eq!(imported.summary.used, 2);
}

#[test]
fn mixed_talkers_are_accepted() {
    for talker in ["GP", "GN", "II", "IN", "EC", "HE"] {
        let s = with_checksum(&format!("{talker}HDT,10.0,T"));
        assert_eq!(
            parse_sentence(&s),
            Ok(vec![Reading::Heading(10.0)]),
            "{talker}"
        );
    }
}

#[test]
fn timestamps_and_tag_blocks() {
    let hdt = with_checksum("GPHDT,1.0,T");
    let p = parse_line(format!("2023-11-14T22:13:20Z {hdt}").as_bytes()).unwrap();
    assert_eq!(p.time_s, Some(1_700_000_000.0));
    let p = parse_line(format!("1700000000.5,{hdt}").as_bytes()).unwrap();
    assert_eq!(p.time_s, Some(1_700_000_000.5));
    let p = parse_line(format!("1700000000500 {hdt}").as_bytes()).unwrap();
    assert_eq!(p.time_s, Some(1_700_000_000.5));
    let tag = "c:1700000000";
    let p = parse_line(format!("\\{tag}*{:02X}\\{hdt}", checksum(tag)).as_bytes()).unwrap();
    assert_eq!(p.time_s, Some(1_700_000_000.0));
    assert_eq!(
        parse_line(format!("\\{tag}*00\\{hdt}").as_bytes()),
        Err(BadLine::BadChecksum)
    );
}

#[test]
fn reader_fills_forward_and_expires() {
    let mut reader = NmeaReader::new(None, 5.0);
    let rpm = with_checksum("ERRPM,E,1,1500,,A");
    let hdt = with_checksum("GPHDT,90.0,T");
    let mut samples = Vec::new();
    samples.extend(reader.push_line(format!("100 {rpm}").as_bytes(), 1, None));
    for t in 101..110 {
        samples.extend(reader.push_line(format!("{t} {hdt}").as_bytes(), t, None));
    }
    samples.extend(reader.finish());
    assert_eq!(samples.len(), 10);
    // rpm read at 100 s is carried to 105 s (5 s limit) and left out after.
    assert_eq!(samples[5].engine_rpm, Some(1500.0));
    assert_eq!(samples[6].engine_rpm, None);
    assert_eq!(samples[9].heading_deg, Some(90.0));
    assert_eq!(reader.summary().used, 10);
}

#[test]
fn invalid_fix_blanks_speed() {
    let mut reader = NmeaReader::new(None, 5.0);
    let good = with_checksum("GPRMC,120000,A,4807.038,N,01131.000,E,5.0,90.0,141123,,");
    let bad = with_checksum("GPRMC,120001,V,,,,,,,141123,,");
    let vtg = with_checksum("GPVTG,90.0,T,,M,5.0,N,9.3,K");
    let hdt = with_checksum("GPHDT,90.0,T");
    let mut samples = Vec::new();
    for line in [&good, &bad, &vtg, &hdt] {
        samples.extend(reader.push_line(line.as_bytes(), 1, None));
    }
    samples.extend(reader.finish());
    assert_eq!(samples.len(), 2);
    assert!(samples[0].speed_over_ground.is_some());
    assert_eq!(samples[1].speed_over_ground, None);
    assert_eq!(reader.date(), Some("2023-11-14"));
    assert_eq!(
        samples[0].time_s,
        1_700_000_000.0 - 22.0 * 3600.0 - 13.0 * 60.0 - 20.0 + 12.0 * 3600.0
    );
}

#[test]
fn automatic_engine_choice() {
    use RpmSource::*;
    assert_eq!(choose_rpm_source(&[Engine(2), Engine(1)]), Some(Engine(1)));
    assert_eq!(choose_rpm_source(&[Engine(3), Engine(2)]), Some(Engine(2)));
    assert_eq!(choose_rpm_source(&[Shaft(1), Engine(0)]), Some(Engine(0)));
    assert_eq!(choose_rpm_source(&[Shaft(2)]), Some(Shaft(2)));
    assert_eq!(choose_rpm_source(&[]), None);
}

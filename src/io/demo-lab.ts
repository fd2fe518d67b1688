/**
 * The embedded demo lab profile: an invented lab with invented tanks, gauges and
 * cylinders, so that the demo recipes run with no set-up. The numbers are for the
 * demo only; a real lab writes its own profile (`mixwright schema lab`).
 */
export const DEMO_LAB_NAME = 'demo:larchmere-bay-3';

export const DEMO_LAB_YAML = `# Demo lab profile - invented for the examples; not a real facility.
name: Larchmere Institute, Kinetics Bay 3 (demo)
notes: Invented lab for examples and tests. Replace every number with your own certificates and ratings.
barometer:
  pressure: 760 Torr
  uncertainty: 0.4 Torr
air: { O2: 0.21, N2: 0.79 }
thermometer:
  uncertainty: 0.3 K
  resolution: 0.1 K
coldest: 18 degC
condensation_fraction: 0.5
tanks:
  - id: MT-1
    label: mixing tank 1, 10.0 L electropolished, magnetic stirrer
    volume: 10.0 L
    rating: 4 bar
    working_fraction: 0.9
    height: 0.32 m
    stirred: true
    base_vacuum: 2e-4 Torr
    leak_rate: 3e-5 Torr/min
  - id: MT-2
    label: mixing tank 2, 30.2 L, heated jacket
    volume: 30.2 L
    rating: 7 bar
    working_fraction: 0.9
    height: 0.55 m
    stirred: true
    base_vacuum: 5e-4 Torr
    leak_rate: 5e-5 Torr/min
reactors:
  - id: ST-A
    label: shock tube A, driven section 4.2 m x 50 mm
    volume: 8.25 L
    line_volume: 0.12 L
    fill_pressure: 40 Torr
  - id: RCM-1
    label: rapid compression machine, reaction chamber and cylinder
    volume: 0.62 L
    line_volume: 0.05 L
    fill_pressure: 900 Torr
fill_margin: 0.1
gauges:
  - id: head-10T
    label: capacitance head, 10 Torr absolute
    reference: absolute
    full_scale: 10 Torr
    accuracy_pct_reading: 0.12
    resolution: 0.0001 Torr
    unit: Torr
    overpressure: 20 Torr
  - id: head-1kT
    label: capacitance head, 1000 Torr absolute
    reference: absolute
    full_scale: 1000 Torr
    accuracy_pct_reading: 0.12
    resolution: 0.01 Torr
    unit: Torr
    overpressure: 2000 Torr
  - id: head-10kT
    label: capacitance head, 10000 Torr absolute
    reference: absolute
    full_scale: 10000 Torr
    accuracy_pct_reading: 0.15
    resolution: 0.1 Torr
    unit: Torr
  - id: xdcr-100g
    label: strain-gauge transducer, 100 psi gauge
    reference: gauge
    full_scale: 100 psi
    minimum: -14.7 psi
    accuracy_pct_reading: 0
    accuracy_pct_full_scale: 0.05
    resolution: 0.01 psi
    unit: psi
cylinders:
  - id: cyl-CH4
    label: methane, grade 4.5
    species: CH4
    purity: 0.99995
    impurities: { N2: 0.00002, C2H6: 0.00001 }
    supply_pressure: 3 bar
  - id: cyl-C2H4
    label: ethylene, grade 3.5
    species: C2H4
    purity: 0.9995
    impurities: { C2H6: 0.0003, CH4: 0.0001 }
    supply_pressure: 3 bar
  - id: cyl-C2H6
    label: ethane, grade 3.5
    species: C2H6
    purity: 0.9995
    impurities: { C2H4: 0.0002, C3H8: 0.0001, CH4: 0.0001 }
    supply_pressure: 3 bar
  - id: cyl-H2
    label: hydrogen, grade 5.0
    species: H2
    purity: 0.99999
    supply_pressure: 4 bar
  - id: cyl-O2
    label: oxygen, grade 4.8
    species: O2
    purity: 0.99998
    impurities: { Ar: 0.00001, N2: 0.00001 }
    supply_pressure: 4 bar
  - id: cyl-Ar
    label: argon, grade 5.0
    species: Ar
    purity: 0.99999
    supply_pressure: 5 bar
  - id: cyl-He
    label: helium, grade 5.0
    species: He
    purity: 0.99999
    supply_pressure: 5 bar
  - id: cyl-N2
    label: nitrogen, grade 5.0
    species: N2
    purity: 0.99999
    supply_pressure: 5 bar
  - id: cyl-air
    label: synthetic air (certified 21.0 % O2 in N2)
    composition: { O2: 0.21, N2: 0.79 }
    supply_pressure: 5 bar
  - id: liq-nC7
    label: n-heptane, degassed liquid (vapour fill)
    species: n-C7H16
    purity: 0.995
    vapour: true
`;

/** DEMO_LAB_YAML, pre-parsed (tests/io/files.test.ts keeps the two equal) */
export const DEMO_LAB_DATA: unknown = {
  name: 'Larchmere Institute, Kinetics Bay 3 (demo)',
  notes: 'Invented lab for examples and tests. Replace every number with your own certificates and ratings.',
  barometer: {
    pressure: '760 Torr',
    uncertainty: '0.4 Torr',
  },
  air: {
    O2: 0.21,
    N2: 0.79,
  },
  thermometer: {
    uncertainty: '0.3 K',
    resolution: '0.1 K',
  },
  coldest: '18 degC',
  condensation_fraction: 0.5,
  tanks: [
    {
      id: 'MT-1',
      label: 'mixing tank 1, 10.0 L electropolished, magnetic stirrer',
      volume: '10.0 L',
      rating: '4 bar',
      working_fraction: 0.9,
      height: '0.32 m',
      stirred: true,
      base_vacuum: '2e-4 Torr',
      leak_rate: '3e-5 Torr/min',
    },
    {
      id: 'MT-2',
      label: 'mixing tank 2, 30.2 L, heated jacket',
      volume: '30.2 L',
      rating: '7 bar',
      working_fraction: 0.9,
      height: '0.55 m',
      stirred: true,
      base_vacuum: '5e-4 Torr',
      leak_rate: '5e-5 Torr/min',
    },
  ],
  reactors: [
    {
      id: 'ST-A',
      label: 'shock tube A, driven section 4.2 m x 50 mm',
      volume: '8.25 L',
      line_volume: '0.12 L',
      fill_pressure: '40 Torr',
    },
    {
      id: 'RCM-1',
      label: 'rapid compression machine, reaction chamber and cylinder',
      volume: '0.62 L',
      line_volume: '0.05 L',
      fill_pressure: '900 Torr',
    },
  ],
  fill_margin: 0.1,
  gauges: [
    {
      id: 'head-10T',
      label: 'capacitance head, 10 Torr absolute',
      reference: 'absolute',
      full_scale: '10 Torr',
      accuracy_pct_reading: 0.12,
      resolution: '0.0001 Torr',
      unit: 'Torr',
      overpressure: '20 Torr',
    },
    {
      id: 'head-1kT',
      label: 'capacitance head, 1000 Torr absolute',
      reference: 'absolute',
      full_scale: '1000 Torr',
      accuracy_pct_reading: 0.12,
      resolution: '0.01 Torr',
      unit: 'Torr',
      overpressure: '2000 Torr',
    },
    {
      id: 'head-10kT',
      label: 'capacitance head, 10000 Torr absolute',
      reference: 'absolute',
      full_scale: '10000 Torr',
      accuracy_pct_reading: 0.15,
      resolution: '0.1 Torr',
      unit: 'Torr',
    },
    {
      id: 'xdcr-100g',
      label: 'strain-gauge transducer, 100 psi gauge',
      reference: 'gauge',
      full_scale: '100 psi',
      minimum: '-14.7 psi',
      accuracy_pct_reading: 0,
      accuracy_pct_full_scale: 0.05,
      resolution: '0.01 psi',
      unit: 'psi',
    },
  ],
  cylinders: [
    {
      id: 'cyl-CH4',
      label: 'methane, grade 4.5',
      species: 'CH4',
      purity: 0.99995,
      impurities: {
        N2: 0.00002,
        C2H6: 0.00001,
      },
      supply_pressure: '3 bar',
    },
    {
      id: 'cyl-C2H4',
      label: 'ethylene, grade 3.5',
      species: 'C2H4',
      purity: 0.9995,
      impurities: {
        C2H6: 0.0003,
        CH4: 0.0001,
      },
      supply_pressure: '3 bar',
    },
    {
      id: 'cyl-C2H6',
      label: 'ethane, grade 3.5',
      species: 'C2H6',
      purity: 0.9995,
      impurities: {
        C2H4: 0.0002,
        C3H8: 0.0001,
        CH4: 0.0001,
      },
      supply_pressure: '3 bar',
    },
    {
      id: 'cyl-H2',
      label: 'hydrogen, grade 5.0',
      species: 'H2',
      purity: 0.99999,
      supply_pressure: '4 bar',
    },
    {
      id: 'cyl-O2',
      label: 'oxygen, grade 4.8',
      species: 'O2',
      purity: 0.99998,
      impurities: {
        Ar: 0.00001,
        N2: 0.00001,
      },
      supply_pressure: '4 bar',
    },
    {
      id: 'cyl-Ar',
      label: 'argon, grade 5.0',
      species: 'Ar',
      purity: 0.99999,
      supply_pressure: '5 bar',
    },
    {
      id: 'cyl-He',
      label: 'helium, grade 5.0',
      species: 'He',
      purity: 0.99999,
      supply_pressure: '5 bar',
    },
    {
      id: 'cyl-N2',
      label: 'nitrogen, grade 5.0',
      species: 'N2',
      purity: 0.99999,
      supply_pressure: '5 bar',
    },
    {
      id: 'cyl-air',
      label: 'synthetic air (certified 21.0 % O2 in N2)',
      composition: {
        O2: 0.21,
        N2: 0.79,
      },
      supply_pressure: '5 bar',
    },
    {
      id: 'liq-nC7',
      label: 'n-heptane, degassed liquid (vapour fill)',
      species: 'n-C7H16',
      purity: 0.995,
      vapour: true,
    },
  ],
};

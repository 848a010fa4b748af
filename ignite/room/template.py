"""The commented room file that `ignite new PATH` writes.

It describes an invented room and shows every section and key of the room-file
contract, with the units and options each key takes and where its value usually comes
from. It must always load cleanly (`tests/test_template.py` checks that).
"""

from __future__ import annotations

TEMPLATE = """\
# ignite room file: one operating theatre and its planned list.
#
# The room, the people and every value below are an invented example: replace each
# value with what was measured or planned for your room. Values with a dimension are
# text with a unit ("28 %", "1.2 MΩ", "4 L/min", "20 degC", "68 degF"); any unit of the
# right dimension is accepted and converted. A bare number where a unit is needed is
# an error, never a guess. Keys the file does not need may be left out only where a
# comment says "optional".
#
# Every value is checked against a plausible range: outside it the file is refused with
# the reason, outside the usual range it is accepted with a warning. Lists are limited:
# 1000 floor readings in each list, 100 groups of people, 100 trolleys, 100 cases,
# 50 ignition sources and 50 materials per case; names and labels to 200 characters.
#
# ignite's results support, and never replace, local codes, the manufacturers'
# instructions and the judgement of a competent, licensed professional.

format: 1                         # room-file format version; this ignite reads 1

room:
  id: BDSU-T2                     # short identifier: letters, digits, . _ - (used in file names)
  name: Theatre 2, Brackenmoor Day Surgery Unit
  purpose: periodic-audit         # pre-list | recommissioning | periodic-audit
  assessed_on: 2026-11-18         # date of the measurements, YYYY-MM-DD
  assessor: M. Ferreira-Lund, clinical engineering
  mains:                          # the supply to the theatre's medical equipment
    voltage: 230 V                # nominal line voltage (100 V to 480 V)
    frequency: 50 Hz              # 45 Hz to 65 Hz
    system: isolated              # isolated (IT supply with insulation monitoring) | earthed

environment:                      # the room as it was (or will be) during the list
  temperature: 21 degC            # air temperature; 5 degC to 45 degC (degF and K work too)
  relative_humidity: 35 %         # from a calibrated hygrometer at the table; 0 % to 100 %
  air_changes: 25 /h              # whole-room air changes per hour, from the ventilation
                                  # validation report (also "25 1/h")
  volume: 150 m^3                 # room volume: floor area x ceiling height

floor:
  finish: static-dissipative vinyl sheet, welded seams
  criteria: medical-location      # which acceptance window applies; `ignite rules` lists them
  test_voltage: 500 V             # voltage the resistance tester applied (10 V to 1000 V)
  point_to_ground:                # each reading from an electrode on the floor to earth,
                                  # as the floor test method describes; at least one
    - 150 kΩ                      # kΩ, MΩ, GΩ, TΩ and "ohm" are all accepted
    - 210 kΩ
    - 380 kΩ
    - 1.1 MΩ
    - 640 kΩ
  point_to_point: [290 kΩ, 450 kΩ]  # optional: readings between two electrodes on the floor

people:                           # everyone who walks in the room during the list
  - role: scrub practitioner
    count: 2                      # how many people of this role (a whole number, 1 or more)
    footwear: antistatic          # a class: conductive | esd | antistatic | insulating,
                                  # or a measured resistance through the soles, e.g. 40 MΩ
    capacitance: 150 pF           # optional: body capacitance to the floor; left out, the
                                  # default in rules/ is used (usual range 20 pF to 1000 pF)
  - role: anaesthetist
    count: 1
    footwear: 35 MΩ               # measured with the footwear tester at the theatre entrance

trolleys:                         # optional: wheeled equipment pushed about during the list
  - name: instrument trolley
    capacitance: 100 pF           # capacitance of the trolley body to the floor
    path_to_floor: 20 MΩ          # resistance from the trolley frame through castors or
                                  # drag chain to the floor, as measured

preparations:                     # optional: skin preparations stocked in the room
  - id: chg-ipa                   # your own short name, used by cases[].prep below
    label: 2 % chlorhexidine gluconate in 70 % isopropanol
    basis: volume                 # volume | mass: what the fractions below are fractions of
    components:                   # each substance by common name or CAS number
      isopropanol: 70 %
      water: 30 %
      # non-volatile actives (chlorhexidine, iodine) may be left out; the fractions
      # may add up to less than 100 % but never more
  - id: pvp-iodine-ethanol
    label: povidone-iodine in ethanol
    basis: mass
    components:
      64-17-5: 60 %               # ethanol, by CAS number
      water: 35 %

materials:                        # optional: drapes, gowns, covers and dressings in the room;
  - nonwoven polypropylene        # `ignite rules` lists the names ignite knows
  - cotton
  - polyethylene

cases:                            # the planned list; may be empty (cases: []) or left out
                                  # for a floor-only audit
  - id: 1                         # unique within the file; numbers and text both work
    procedure: excision of a lesion from the cheek under sedation
    site: head-neck               # head-neck | chest | abdomen | pelvis | limb | back
    oxygen:
      delivery: nasal-cannula     # none | nasal-cannula | face-mask | closed-airway
      flow: 3 L/min               # oxygen-bearing gas flow (0 L/min with delivery: none)
      fraction: 100 %             # oxygen fraction of that delivered gas
      nitrous_oxide_flow: 0 L/min # nitrous oxide supports burning like oxygen; counted with it
      stop_before_activation: 60 s  # oxygen turned off this long before the first
                                    # activation of an ignition source (0 s if it is not)
    drape_pocket:                 # the space under the drapes around the operative site
      volume: 25 L                # estimated gas volume of the pocket (1 L to 500 L)
      exchange: 6 to 10 L/min     # fresh room air flowing through it. Not sure of a value?
                                  # give a range: "6 to 10 L/min" (uniform), "8 L/min ±
                                  # 2 L/min" (normal, ± one SD) or {low: 5 L/min, likely:
                                  # 8 L/min, high: 12 L/min}; see docs/ranges.md
    prep:                         # the skin preparation for this case; "prep: none" if none
      preparation: chg-ipa        # an id from preparations above
      volume: 8 mL                # liquid applied
      area: 300 cm^2              # skin area painted
      hair: false                 # true if applied over hair (holds liquid, dries slower)
      pooling: false              # true if liquid can pool (skin folds, under the patient)
      skin_temperature: 33 degC   # optional: skin temperature (20 degC to 42 degC); left
                                  # out, the default in rules/ is used
    air_speed: 0.15 m/s           # air speed over the site before draping
    draping_after: 3 min          # time from the end of the prep to drapes on
    first_activation_after: 6 min # time from the end of the prep to the first use of an
                                  # ignition source
    materials: [nonwoven polypropylene, cotton]   # those near the site; may be []
    ignition_sources:             # those used in this case; may be []
      - monopolar electrosurgery
      - fibre-optic light cable

  - id: 2
    procedure: carpal tunnel release under local anaesthetic
    site: limb
    oxygen:
      delivery: none              # no supplemental oxygen: all flows 0 L/min
      flow: 0 L/min
      fraction: 21 %
      nitrous_oxide_flow: 0 L/min
      stop_before_activation: 0 s
    drape_pocket:
      volume: 10 L
      exchange: 20 L/min
    prep: none                    # no alcohol-based preparation in this case
    air_speed: 0.15 m/s
    draping_after: 2 min
    first_activation_after: 5 min
    materials: [nonwoven polypropylene]
    ignition_sources: [bipolar electrosurgery]

electrical:                       # optional: the patient environment's electrical safety
                                  # (docs/electrical.md); every part below is optional too
  supply:
    system: isolated              # isolated | earthed; as room.mains.system
    transformer_rating: 8 kVA     # isolated only: the isolating transformer
    insulation_monitor:           # isolated only
      alarm_setting: 50 kΩ        # the resistance it is set to alarm at
      tested_alarm_at: 51 kΩ      # optional: where it alarmed on test (a test resistor)
      insulation_reading: 4 MΩ    # optional: the supply's insulation as the monitor reads it
  bonding:                        # each bonded part, to the equipotential bonding bar
    - {point: operating table column, kind: exposed, resistance: 0.07 Ω}
    - {point: medical gas pipework, kind: extraneous, resistance: 0.05 Ω}
  equipment:                      # each device in the patient environment, as last tested
    - id: monitor-1               # unique; cases below name the devices by it
      kind: patient monitor
      protection_class: I         # I | II | internal (internally powered)
      applied_part: CF            # B | BF | CF | none
      test: recurrent             # recurrent (IEC 62353) | type (IEC 60601-1)
      earth_leakage: 150 µA       # optional, each: a current in normal condition, or
      touch_current: 12 µA        # {normal: ..., single_fault: ...} (type tests only)
      patient_leakage: 4 µA
  cases:                          # per case: its paths to the heart, the devices on it
    - case: 1
      cardiac_path: none          # central-line | pacing-wires | none
      connected: [monitor-1]
"""

#!/usr/bin/env python3
"""Writes the FHIR R4 bulk-data fixture in this folder: dispensing_r4.ndjson (MedicationDispense,
Patient and Medication resources, one per line, with some malformed lines), registry.csv (a
registry that uses NHS-number-shaped ids, imported first) and expected.csv (how a pharmacist
reads each line). Every resource is written from the HL7 FHIR R4 specification
(https://hl7.org/fhir/R4/medicationdispense.html and the pages it links); the "section"
column names the part of the specification each case exercises.

Patients, identifiers, brands and codes are invented. NHS-number-shaped values start with
999, the range kept for test data (common practice). SNOMED CT and dm+d codes below are
invented too: the test that reads this fixture adds them to its formulary; the RxNorm code
6809 (metformin) is real and is also in formulary/codes.csv.

Run from anywhere: python3 tests/data/fhir/make_fixture.py
"""
import csv
import json
import pathlib

HERE = pathlib.Path(__file__).resolve().parent

RXNORM = "http://www.nlm.nih.gov/research/umls/rxnorm"
SNOMED = "http://snomed.info/sct"
DMD = "https://dmd.nhs.uk"
ATC = "http://www.whocc.no/atc"
UCUM = "http://unitsofmeasure.org"
NHS = "https://fhir.nhs.uk/Id/nhs-number"
MRN = "https://ehr.example.org/Id/mrn"

CERYS_ID = "3f2a6c1e-8b4d-4e2a-9c1f-5d7e8a9b0c11"
DAFYDD_URN = "urn:uuid:7b1e4d2c-5a6f-4b3e-8c9d-0e1f2a3b4c5d"
ELIN_URN = "urn:uuid:c0ffee00-1234-4abc-8def-0123456789ab"

lines = []     # the NDJSON lines, in order
expected = []  # one row per line


def add(resource, outcome, section, reason="", patient="", counts="", ingredients="", supply="", per_day=""):
    text = resource if isinstance(resource, str) else json.dumps(resource, separators=(",", ":"))
    lines.append(text)
    rid = resource.get("id", "") if isinstance(resource, dict) else ""
    if isinstance(resource, dict) and "resource" in resource:
        rid = resource["resource"].get("id", "")
    expected.append({"line": len(lines), "id": rid if isinstance(rid, str) else "", "outcome": outcome,
                     "reason": reason, "patient": patient, "counts": counts, "ingredients": ingredients,
                     "supply_days": supply, "units_per_day": per_day, "section": section})


def qty(value, unit=None, code=None, system=None):
    q = {"value": value}
    if unit is not None:
        q["unit"] = unit
    if code is not None:
        q["code"] = code
        q["system"] = system or UCUM
    return q


def days(value, code="d", unit=None):
    d = {"value": value, "system": UCUM, "code": code}
    if unit:
        d["unit"] = unit
    return d


def dose(value, unit, code=None):
    d = {"value": value, "unit": unit}
    if code:
        d["system"] = UCUM
        d["code"] = code
    return {"doseQuantity": d}


def timing(frequency=None, period=None, unit=None, when=None, code=None):
    t = {}
    if frequency is not None or when is not None:
        t["repeat"] = {}
    if frequency is not None:
        t["repeat"].update({"frequency": frequency, "period": period, "periodUnit": unit})
    if when is not None:
        t["repeat"]["when"] = when
    if code is not None:
        t["code"] = {"coding": [{"system": "http://terminology.hl7.org/CodeSystem/v3-GTSAbbreviation",
                                 "code": code}]}
    return t


def dispense(did, subject, medication, quantity, handed="2024-03-04", status="completed", days_supply=None,
             dosage=None, extra=None):
    r = {"resourceType": "MedicationDispense", "id": did, "status": status, "subject": subject}
    r.update(medication)
    r["quantity"] = quantity
    if days_supply is not None:
        r["daysSupply"] = days_supply
    if handed is not None:
        r["whenHandedOver"] = handed
    if dosage is not None:
        r["dosageInstruction"] = dosage
    if extra:
        r.update(extra)
    return r


def ref(reference):
    return {"reference": reference}


def ident(value, system=NHS):
    i = {"value": value}
    if system:
        i["system"] = system
    return {"identifier": i}


def text(product, *codings):
    concept = {"text": product} if product else {}
    if codings:
        concept["coding"] = [dict(zip(("system", "code", "display"), c)) for c in codings]
        for c in concept["coding"]:
            if c.get("display") is None:
                c.pop("display", None)
    return {"medicationCodeableConcept": concept}


def instr(text_value=None, **parts):
    d = {}
    if text_value:
        d["text"] = text_value
    d.update(parts)
    return [d]


ANWEN = ref("Patient/pt-anwen")
BRYN = ref("Patient/pt-bryn")
TAB = qty  # readability below

# --- Patients (HL7 FHIR R4 Patient) and a Medication read before it is referenced ---
add({"resourceType": "Patient", "id": "pt-anwen", "identifier": [{"system": NHS, "value": "9990000018"}],
     "gender": "female", "birthDate": "1941-05-12", "generalPractitioner": [ref("Organization/WV01")]},
    "patient", "Patient.identifier, Patient.generalPractitioner")
add({"resourceType": "Patient", "id": "pt-bryn",
     "identifier": [{"system": NHS, "value": "9990000026"}, {"system": MRN, "value": "M-2204"}],
     "gender": "male", "birthDate": "1938", "generalPractitioner": [{"identifier": {"value": "WV01"}}]},
    "patient", "Patient.identifier (two systems); Patient.birthDate year only")
add({"resourceType": "Patient", "id": CERYS_ID, "gender": "female", "birthDate": "1950-02"},
    "patient", "Resource.id holding a UUID (referenced as urn:uuid)")
add({"fullUrl": DAFYDD_URN, "resource": {"resourceType": "Patient", "id": "pt-dafydd", "gender": "male",
                                          "birthDate": "1947-11-30"}},
    "patient", "Bundle.entry.fullUrl as urn:uuid (references.html: resolving in bundles)")
add({"resourceType": "Patient", "id": "pt-elin", "identifier": [{"system": "urn:ietf:rfc:3986", "value": ELIN_URN}],
     "gender": "female", "birthDate": "1944-08-09"},
    "patient", "Identifier.system urn:ietf:rfc:3986 (a URI as identifier)")
add({"resourceType": "Patient", "id": "pt-ffion", "gender": "female", "birthDate": "1952-01-20"},
    "patient", "Patient")
add({"resourceType": "Medication", "id": "med-sertraline", "code": {"text": "Sertraline 50mg tablets"},
     "form": {"text": "tablet"},
     "ingredient": [{"itemCodeableConcept": {"text": "sertraline"}, "isActive": True,
                     "strength": {"numerator": {"value": 50, "unit": "mg", "system": UCUM, "code": "mg"},
                                  "denominator": {"value": 1, "unit": "tablet", "system": UCUM, "code": "{tbl}"}}}]},
    "medication", "Medication.ingredient.strength (Ratio)")

# --- Anwen: reference forms, codes, ingredients, as-needed, statuses, dates ---
add(dispense("d01", ANWEN, text("Amlodipine 5mg tablets"), qty(28, "tablet", "{tbl}"),
             handed="2024-02-29T09:30:00+01:00", days_supply=days(28),
             dosage=instr("one daily", timing=timing(1, 1, "d"), doseAndRate=[dose(1, "tablet")])),
    "imported", "whenHandedOver dateTime with time zone on a leap day; daysSupply UCUM d",
    patient="pt-anwen", counts="yes", ingredients="amlodipine", supply="28", per_day="1")
add(dispense("d02", ident("9990000018"), text("Metformin 500mg tablets", (RXNORM, "6809", "metformin")),
             qty(56, "tablet"), dosage=instr("one twice a day", timing=timing(code="BID"),
                                             doseAndRate=[dose(1, "tablet")])),
    "imported", "subject Reference.identifier (NHS number) -> Patient.identifier; Timing.code BID",
    patient="pt-anwen", counts="yes", ingredients="metformin", supply="28", per_day="2")
add(dispense("d03", ANWEN, text(None, (RXNORM, "6809", None)), qty(56, "tablet"), days_supply=days(4, "wk"),
             dosage=instr("1 tablet twice a day")),
    "imported", "medicationCodeableConcept with an RxNorm code alone; daysSupply UCUM wk",
    patient="pt-anwen", counts="yes", ingredients="metformin", supply="28", per_day="2")
add(dispense("d04", ANWEN, {"contained": [{"resourceType": "Medication", "id": "m1", "code": {"text": "Oxyvance"},
                                           "form": {"text": "tablet"},
                                           "ingredient": [{"itemCodeableConcept": {"text": "oxybutynin hydrochloride"},
                                                           "strength": {"numerator": {"value": 5, "unit": "mg"},
                                                                        "denominator": {"value": 1, "unit": "tablet"}}}]}],
                            "medicationReference": ref("#m1")},
             qty(84, "tablet"), dosage=instr("5mg three times a day", timing=timing(code="TID"),
                                             doseAndRate=[dose(5, "mg", "mg")])),
    "imported", "contained Medication: brand text, ingredient[] and strength, no code; dose in mg",
    patient="pt-anwen", counts="yes", ingredients="oxybutynin", supply="28", per_day="3")
add(dispense("d05", ANWEN, text("Paracetamol 500mg tablets"), qty(100, "tablet"),
             dosage=instr("1-2 up to four times a day when required", asNeededBoolean=True,
                          timing=timing(4, 1, "d"),
                          doseAndRate=[{"doseRange": {"low": {"value": 1, "unit": "tablet"},
                                                      "high": {"value": 2, "unit": "tablet"}}}])),
    "imported", "Dosage.asNeededBoolean; doseAndRate.doseRange (upper value)",
    patient="pt-anwen", counts="yes", ingredients="paracetamol", supply="13", per_day="8")
add(dispense("d06", ANWEN, text("Co-codamol 30mg/500mg tablets"), qty(100, "tablet"),
             dosage=instr("1-2 when required for pain, at most 8 in 24 hours",
                          asNeededCodeableConcept={"text": "pain"}, timing=timing(4, 1, "d"),
                          doseAndRate=[{"doseRange": {"low": {"value": 1, "unit": "tablet"},
                                                      "high": {"value": 2, "unit": "tablet"}}}],
                          maxDosePerPeriod={"numerator": {"value": 8, "unit": "tablet"},
                                            "denominator": {"value": 1, "unit": "day", "system": UCUM, "code": "d"}})),
    "imported", "Dosage.asNeededCodeableConcept; Dosage.maxDosePerPeriod",
    patient="pt-anwen", counts="yes", ingredients="codeine|paracetamol", supply="13", per_day="8")
add(dispense("d07", ANWEN, text("Sertraline 50mg tablets"), qty(28, "tablet"), status="stopped",
             days_supply=days(28)),
    "imported", "MedicationDispense.status stopped (handed over, does not count)",
    patient="pt-anwen", counts="no")
add(dispense("d08", ANWEN, text("Omeprazole 20mg gastro-resistant capsules"), qty(28, "capsule"), status="unknown",
             days_supply=days(28)),
    "imported", "MedicationDispense.status unknown (does not count)", patient="pt-anwen", counts="no")
add(dispense("d09", ANWEN, text("Amlodipine 5mg tablets"), qty(28, "tablet"), status="entered-in-error",
             days_supply=days(28)),
    "imported", "MedicationDispense.status entered-in-error", patient="pt-anwen", counts="no")
add(dispense("d10", ANWEN, text("Atorvastatin 40mg tablets"), qty(28, "tablet"), handed=None, days_supply=days(28),
             extra={"whenPrepared": "2024-03-02T14:00:00Z"}),
    "imported", "whenPrepared when whenHandedOver is absent",
    patient="pt-anwen", counts="yes", ingredients="atorvastatin", supply="28")
add(dispense("d11", ANWEN, text("Cetirizine 10mg tablets"), qty(30, code="1"),
             dosage=instr("one daily", timing=timing(1, 1, "d"), doseAndRate=[dose(1, "tablet")])),
    "imported", "quantity in UCUM unity 1 (counted in the product's dose units)",
    patient="pt-anwen", counts="yes", ingredients="cetirizine", supply="30", per_day="1")
add(dispense("d12", ANWEN, text("Paracetamol 250mg/5ml oral suspension"), qty(200, "mL", "mL"),
             dosage=instr("500mg four times a day", timing=timing(4, 1, "d"), doseAndRate=[dose(500, "mg", "mg")])),
    "imported", "dose in mg of a liquid: through the strength per ml",
    patient="pt-anwen", counts="yes", ingredients="paracetamol", supply="5", per_day="40")

# --- Bryn: absolute and versioned references, identifier in a second system, units ---
add(dispense("d13", ref("https://ehr.example.org/fhir/r4/Patient/pt-bryn"), text("Gabapentin 600mg tablets"),
             qty(90, "tablet"), dosage=instr("600mg every 8 hours", timing=timing(1, 8, "h"),
                                             doseAndRate=[dose(600, "mg", "mg")])),
    "imported", "absolute literal reference; dose in mg converted through the strength",
    patient="pt-bryn", counts="yes", ingredients="gabapentin", supply="30", per_day="3")
add(dispense("d14", ident("M-2204", MRN), text("Lactulose 3.35g/5ml oral solution"), qty(500, "mL"),
             dosage=instr("15ml twice a day", timing=timing(2, 1, "d"), doseAndRate=[dose(15, "mL", "mL")])),
    "imported", "subject Reference.identifier in a local system",
    patient="pt-bryn", counts="yes", ingredients="lactulose", supply="17", per_day="30")
add(dispense("d15", ref("Patient/pt-bryn/_history/3"), text("Amitriptyline 10mg tablets"), qty(28, "tablet"),
             dosage=instr("one at night", timing=timing(when=["HS"]), doseAndRate=[dose(1, "tablet")])),
    "imported", "literal reference with _history; Timing.repeat.when HS",
    patient="pt-bryn", counts="yes", ingredients="amitriptyline", supply="28", per_day="1")
add(dispense("d16", BRYN, text("Ramipril 2.5mg capsules"), qty(56, "capsule"),
             dosage=instr(timing=timing(code="BID"))),
    "imported", "Timing.code BID without doseQuantity: one capsule each time",
    patient="pt-bryn", counts="yes", ingredients="ramipril", supply="28", per_day="2")
add(dispense("d17", BRYN, text("Morphine sulfate 10mg/5ml oral solution"), qty(100, "mL"),
             dosage=instr(timing=timing(code="BID"))),
    "imported", "Timing without doseQuantity for a liquid: amount a day unknown",
    patient="pt-bryn", counts="yes", ingredients="morphine", supply="28", per_day="")
add(dispense("d18", BRYN, text("Bisoprolol 2.5mg tablets"), qty(30, "tablet"), days_supply=days(1, "mo")),
    "imported", "daysSupply UCUM mo (30 days)", patient="pt-bryn", counts="yes", ingredients="bisoprolol", supply="30")
add(dispense("d19", BRYN, text("Amoxicillin 500mg capsules"), qty(6, "capsule"), days_supply=days(36, "h"),
             dosage=instr("500mg three times a day", timing=timing(3, 1, "d"), doseAndRate=[dose(500, "mg", "mg")])),
    "imported", "daysSupply UCUM h, rounded up to whole days",
    patient="pt-bryn", counts="yes", ingredients="amoxicillin", supply="2", per_day="3")
add(dispense("d20", BRYN, text("Senna 7.5mg/5ml oral syrup"), qty(0.3, "L", "L"),
             dosage=instr("10ml at night", timing=timing(when=["HS"]), doseAndRate=[dose(10, "mL", "mL")])),
    "imported", "quantity in UCUM L (stored in ml)",
    patient="pt-bryn", counts="yes", ingredients="senna", supply="30", per_day="10")
add(dispense("d21", BRYN, text("Paracetamol 500mg tablets"), qty(32, "tablet"),
             dosage=instr("1g four times a day", timing=timing(4, 1, "d"), doseAndRate=[dose(1, "g", "g")])),
    "imported", "dose in g converted through the strength",
    patient="pt-bryn", counts="yes", ingredients="paracetamol", supply="4", per_day="8")

# --- Cerys: urn:uuid of a Patient id; codes of several systems ---
add(dispense("d22", ref("urn:uuid:" + CERYS_ID), text("Furosemide 40mg tablets"), qty(28, "tablet"),
             dosage=instr("one each morning", timing=timing(code="QD"), doseAndRate=[dose(1, "tablet")])),
    "imported", "subject urn:uuid naming a Patient.id", patient=CERYS_ID, counts="yes",
    ingredients="furosemide", supply="28", per_day="1")
add(dispense("d23", ref("Patient/" + CERYS_ID), text("Levothyroxine 75microgram tablets"), qty(28, "tablet"),
             dosage=instr("75 micrograms each morning", timing=timing(1, 1, "d"), doseAndRate=[dose(75, "ug", "ug")])),
    "imported", "dose in UCUM ug converted through the strength", patient=CERYS_ID, counts="yes",
    ingredients="levothyroxine", supply="28", per_day="1")
add(dispense("d24", ref("Patient/" + CERYS_ID), text(None, (SNOMED, "19990001", None)), qty(28, "tablet"),
             days_supply=days(28)),
    "imported", "SNOMED CT code alone", patient=CERYS_ID, counts="yes", ingredients="lisinopril", supply="28")
add(dispense("d25", ref("Patient/" + CERYS_ID), text(None, (ATC, "N06AB06", None)), qty(28, "tablet"),
             days_supply=days(28)),
    "imported", "ATC code alone", patient=CERYS_ID, counts="yes", ingredients="sertraline", supply="28")

# --- Dafydd: urn:uuid of an entry's fullUrl; dm+d as SNOMED CT; patches ---
add(dispense("d26", ref(DAFYDD_URN), text(None, (SNOMED, "39990011000001107", "Quetiapine 25mg tablets")),
             qty(56, "tablet"), days_supply=days(28)),
    "imported", "subject urn:uuid naming a fullUrl; a dm+d code under the SNOMED CT system",
    patient="pt-dafydd", counts="yes", ingredients="quetiapine", supply="28")
add(dispense("d27", ref("Patient/pt-dafydd"), text("Fentanyl 12micrograms/hour transdermal patches"),
             qty(5, "patch"), dosage=instr("apply one patch every 72 hours", timing=timing(1, 72, "h"),
                                           doseAndRate=[dose(1, "patch")])),
    "imported", "Timing.repeat period 72 h", patient="pt-dafydd", counts="yes", ingredients="fentanyl",
    supply="15", per_day="0.333")
add(dispense("d28", ref("Patient/pt-dafydd"), text("Buprenorphine 5micrograms/hour seven day patches"),
             qty(4, "patch"), dosage=instr("apply one patch each week", timing=timing(1, 1, "wk"),
                                           doseAndRate=[dose(1, "patch")])),
    "imported", "Timing.repeat periodUnit wk", patient="pt-dafydd", counts="yes", ingredients="buprenorphine",
    supply="28", per_day="0.143")

# --- Elin: urn:uuid of an identifier; dm+d system; concurrent instructions ---
add(dispense("d29", ref(ELIN_URN), text(None, (DMD, "39990021000001102", None)), qty(28, "tablet"),
             days_supply=days(28)),
    "imported", "subject urn:uuid naming Identifier urn:ietf:rfc:3986; dm+d code alone",
    patient="pt-elin", counts="yes", ingredients="donepezil", supply="28")
add(dispense("d30", ref("Patient/pt-elin"), text("Diazepam 2mg tablets"), qty(30, "tablet"),
             dosage=instr("1-2 three times a day", asNeededBoolean=False, timing=timing(3, 1, "d"),
                          doseAndRate=[{"doseRange": {"low": {"value": 1, "unit": "tablet"},
                                                      "high": {"value": 2, "unit": "tablet"}}}])),
    "imported", "doseRange, asNeededBoolean false", patient="pt-elin", counts="yes", ingredients="diazepam",
    supply="5", per_day="6")
add(dispense("d31", ref("Patient/pt-elin"), text("Bendroflumethiazide 2.5mg tablets"), qty(28, "tablet"),
             dosage=instr("one in the morning", timing=timing(when=["MORN"]), doseAndRate=[dose(1, "tablet")])),
    "imported", "Timing.repeat.when MORN", patient="pt-elin", counts="yes", ingredients="bendroflumethiazide",
    supply="28", per_day="1")
add(dispense("d32", ref("Patient/pt-elin"), text("Quetiapine 25mg tablets"), qty(84, "tablet"),
             dosage=[{"sequence": 1, "text": "one in the morning", "timing": timing(when=["MORN"]),
                      "doseAndRate": [dose(1, "tablet")]},
                     {"sequence": 1, "text": "two at night", "timing": timing(when=["HS"]),
                      "doseAndRate": [dose(2, "tablet")]}]),
    "imported", "two Dosage elements of one sequence (taken together)", patient="pt-elin", counts="yes",
    ingredients="quetiapine", supply="28", per_day="3")
add(dispense("d33", ref("Patient/pt-elin"), text(None, ("https://ehr.example.org/local-formulary", "LF-88", "Local item 88"),
                                                  (RXNORM, "6809", "metformin")),
             qty(56, "tablet"), dosage=instr(timing=timing(code="BID"), doseAndRate=[dose(1, "tablet")])),
    "imported", "CodeableConcept with a local coding before an RxNorm one", patient="pt-elin", counts="yes",
    ingredients="metformin", supply="28", per_day="2")

# --- Ffion: versioned absolute reference, Medication resources, dates ---
add(dispense("d34", ref("https://ehr.example.org/fhir/Patient/pt-ffion/_history/7"),
             text("Omeprazole 20mg gastro-resistant capsules"), qty(28, "capsule"), days_supply=days(28)),
    "imported", "absolute literal reference with _history", patient="pt-ffion", counts="yes",
    ingredients="omeprazole", supply="28")
add(dispense("d35", ref("Patient/pt-ffion"), text("Zopiclone 7.5mg tablets"), qty(14, "tablet"),
             dosage=instr(asNeededBoolean=True, timing=timing(1, 1, "d"))),
    "imported", "as needed, at most once a day, no doseQuantity: one tablet each time",
    patient="pt-ffion", counts="yes", ingredients="zopiclone", supply="14", per_day="1")
add(dispense("d36", ref("Patient/pt-ffion"), text("Simvastatin 40mg tablets"), qty(28, "tablet"),
             handed="2024-03-05", days_supply=days(28)),
    "imported", "whenHandedOver as a date alone", patient="pt-ffion", counts="yes", ingredients="simvastatin",
    supply="28")
add(dispense("d37", ref("Patient/pt-ffion"), text("Aspirin 75mg dispersible tablets"), qty(28, "tablet"),
             handed="2024-03-31T23:30:00-05:00", days_supply=days(28)),
    "imported", "whenHandedOver late in the day with a negative offset (the date as written)",
    patient="pt-ffion", counts="yes", ingredients="aspirin", supply="28")
add(dispense("d38", ref("Patient/pt-ffion"), {"medicationReference": ref("Medication/med-sertraline")},
             qty(28, "tablet"), days_supply=days(28)),
    "imported", "medicationReference to a Medication read earlier", patient="pt-ffion", counts="yes",
    ingredients="sertraline", supply="28")
add(dispense("d39", ref("Patient/pt-ffion"), {"medicationReference": ref("Medication/med-tramadol")},
             qty(100, "capsule"), dosage=instr("50mg four times a day", timing=timing(4, 1, "d"),
                                               doseAndRate=[dose(50, "mg", "mg")])),
    "imported", "medicationReference to a Medication on a later line", patient="pt-ffion", counts="yes",
    ingredients="tramadol", supply="25", per_day="4")

# --- Gwyn: subject by identifier before the Patient line; registry ids; no registry row ---
add(dispense("d40", ident("9990000034"), text("Simvastatin 40mg tablets"), qty(28, "tablet"), days_supply=days(28)),
    "imported", "subject Reference.identifier of a Patient on a later line", patient="pt-gwyn", counts="yes",
    ingredients="simvastatin", supply="28")
add(dispense("d41", ident("9990000034", None), text("Aspirin 75mg dispersible tablets"), qty(28, "tablet"),
             days_supply=days(28)),
    "imported", "Identifier without a system (matched on its value)", patient="pt-gwyn", counts="yes",
    ingredients="aspirin", supply="28")
add(dispense("d42", ident("9990000042"), text("Warfarin 1mg tablets"), qty(28, "tablet"), days_supply=days(28)),
    "imported", "identifier value that is the registry's own patient_id", patient="9990000042", counts="yes",
    ingredients="warfarin", supply="28")
add(dispense("d43", ref("Patient/9990000042"), text("Prednisolone 5mg tablets"), qty(28, "tablet"),
             days_supply=days(14)),
    "imported", "literal reference to a registry patient", patient="9990000042", counts="yes",
    ingredients="prednisolone", supply="14")
add(dispense("d44", ref("Patient/pt-harri"), text("Ibuprofen 400mg tablets"), qty(24, "tablet"),
             dosage=instr("one three times a day when required", asNeededBoolean=True, timing=timing(3, 1, "d"),
                          doseAndRate=[dose(1, "tablet")])),
    "imported", "literal reference to a patient in no registry (stored, with a warning)", patient="pt-harri",
    counts="yes", ingredients="ibuprofen", supply="8", per_day="3")
add(dispense("d45", ref("Patient/pt-ffion"), text("Lactulose 3.35g/5ml oral solution"), qty(300, "mL"),
             days_supply=days(2, "wk", "week")),
    "imported", "daysSupply in weeks (UCUM wk with the unit spelled out)", patient="pt-ffion", counts="yes",
    ingredients="lactulose", supply="14")
add({"resourceType": "Patient", "id": "pt-gwyn", "identifier": [{"system": NHS, "value": "9990000034"}],
     "gender": "male", "birthDate": "1936-04-01"},
    "patient", "Patient after the dispenses that name it by identifier")
add({"resourceType": "Medication", "id": "med-tramadol", "code": {"text": "Tramadol 50mg capsules"},
     "ingredient": [{"itemCodeableConcept": {"coding": [{"system": SNOMED, "code": "19990002", "display": "Tramadol"}]},
                     "strength": {"numerator": {"value": 50, "unit": "mg"}, "denominator": {"value": 1, "unit": "capsule"}}}]},
    "medication", "Medication on a line after the dispense that names it")

# --- Malformed lines: each rejected with its reason ---
add('{"resourceType":"MedicationDispense","id":"x01","status":"completed",', "rejected", "NDJSON: one JSON object a line",
    reason="bad_json")
add({"resourceType": "MedicationDispense", "id": "x02", "subject": ANWEN, **text("Amlodipine 5mg tablets"),
     "quantity": qty(28, "tablet"), "whenHandedOver": "2024-03-04"},
    "rejected", "MedicationDispense.status is required (1..1)", reason="missing_status")
add(dispense("x03", ref("Patient/../../X/_history/1"), text("Amlodipine 5mg tablets"), qty(28, "tablet")),
    "rejected", "literal references: Type/id with the id pattern", reason="bad_reference")
add({**dispense("x04", ANWEN, text("Amlodipine 5mg tablets"), qty(28, "tablet")), "id": 123},
    "rejected", "Resource.id is a string of the id pattern", reason="bad_id")
add(dispense("x05", ident("9990000050"), text("Amlodipine 5mg tablets"), qty(28, "tablet")),
    "rejected", "Reference.identifier naming no known Patient", reason="unknown_subject")
add(dispense("x06", ref("urn:uuid:00000000-1111-4222-8333-444444444444"), text("Amlodipine 5mg tablets"),
             qty(28, "tablet")),
    "rejected", "urn:uuid naming no known Patient", reason="unknown_subject")
add(dispense("x07", ANWEN, {"medicationCodeableConcept": {}}, qty(28, "tablet")),
    "rejected", "medication[x] with nothing readable", reason="missing_product")
add(dispense("x08", ANWEN, text("Amlodipine 5mg tablets"), qty(28, "tablet"), days_supply={"value": 2, "unit": "kg"}),
    "rejected", "daysSupply in a unit that is not time", reason="bad_days_supply")
add(dispense("x09", ref("Group/7"), text("Amlodipine 5mg tablets"), qty(28, "tablet")),
    "rejected", "MedicationDispense.subject references Patient or Group: a Group is not read", reason="missing_patient")
add({"resourceType": "Observation", "id": "x10", "status": "final"}, "rejected", "resource types read",
    reason="unsupported_resource")
add({"resourceType": "Patient", "id": 42, "gender": "female"}, "rejected", "Patient.id is a string", reason="bad_id")

(HERE / "dispensing_r4.ndjson").write_text("\n".join(lines) + "\n")
(HERE / "registry.csv").write_text("patient_id,birth_date,sex,practice\n9990000042,1940,F,WV01\n")
with open(HERE / "expected.csv", "w", newline="") as f:
    writer = csv.DictWriter(f, fieldnames=list(expected[0].keys()), lineterminator="\n")
    writer.writeheader()
    writer.writerows(expected)

#!/usr/bin/env python3
"""Writes the seed corpora in tests/fuzz/corpus/<target>/: a few valid inputs (excerpts of
tests/data and demo-patients) and edge cases. Run from anywhere; it rewrites the folder."""
import pathlib
import shutil

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent.parent
CORPUS = HERE / "corpus"


def head(path, lines):
    with open(ROOT / path, "rb") as f:
        return b"".join(f.readline() for _ in range(lines))


def nested(open_, close, depth):
    return open_ * depth + close * depth


CSV = {
    "dispensing_data": (ROOT / "tests/data/import/dispensing.csv").read_bytes(),
    "dispensing_bad": (ROOT / "tests/data/import/dispensing_bad.csv").read_bytes(),
    "dispensing_mapped": (ROOT / "tests/data/import/dispensing_mapped.csv").read_bytes(),
    "patients": (ROOT / "tests/data/import/patients.csv").read_bytes(),
    "practices": (ROOT / "tests/data/import/practices.csv").read_bytes(),
    "reviews": (ROOT / "tests/data/import/reviews.csv").read_bytes(),
    "demo_dispensing": head("demo-patients/dispensing.csv", 6),
    "demo_patients": head("demo-patients/patients.csv", 5),
    "bom_crlf": b"\xef\xbb\xbfpatient_id,reviewed_on\r\nP1,2024-01-20\r\nP2,20/01/2024\r\n",
    "cr_only": b"patient_id,reviewed_on\rP1,2024-01-20\rP2,2024-01-21\r",
    "quotes": b'practice,name,network,list_size\n"A1","Say ""hello"", twice",N,"12"\n'
              b'A2,"two\nlines",N,3\nA3,x"y,N,4\nA4,"a"b,N,5\n"A5\n',
    "blank_lines": b"patient_id,reviewed_on\n\n   \n\t\nP1,2024-01-20\n \r\n",
    "nul": b"patient_id,reviewed_on\nP\x001,2024-01-20\n\x00\n",
    "invalid_utf8": b"patient_id,reviewed_on\nP\xff1,2024-01-20\n\xc3\x28,\xed\xa0\x80\n\xf4\x90\x80\x80\n",
    "huge_numbers": b"patient_id,dispensed_on,product,quantity,days_supply\n"
                    b"P1,2024-01-03,x,1e308,999999999\nP1,2024-01-03,x,1e309,1e9\n"
                    b"P1,2024-01-03,x,-0,2147483648\nP1,2024-01-03,x,nan,inf\n"
                    b"P1,2024-01-03,x,0x10,00028.0\n",
    "limits": b"aaaaaaa,bbbbbbbb\r\n1,2,3,4,5,6\n" + b" " * 50 + b"\n\"1234567\"\r\n",
    "dates": b"patient_id,birth_date,sex,practice,registered_from,registered_to\n"
             b"P1,1939,F,WV01,2020-02-29,2019-02-28\nP2,1939-07,m,,2021-02-29,\n"
             b"P3,1799-12-31,U,,2024-03-01T10:00:00Z,\n",
}

NDJSON = {
    "data": (ROOT / "tests/data/import/dispensing.ndjson").read_bytes()[:3000].rsplit(b"\n", 1)[0] + b"\n",
    "bom_crlf": b'\xef\xbb\xbf{"resourceType":"Patient","id":"P1","gender":"x"}\r\n\r\n'
                b'{"resourceType":"Patient","id":"P2","birthDate":"1939"}',
    "not_json": b'{"resourceType":\n[1,2]\n"text"\n{"resourceType":"Observation"}\n{}\n',
    "invalid_utf8": b'{"resourceType":"Patient","id":"\xff"}\n{"resourceType":"Patient","id":"\xed\xa0\x80"}\n',
    "nul": b'{"resourceType":"Patient","id":"P\x00"}\n\x00\n',
    "huge_numbers": b'{"resourceType":"MedicationDispense","subject":{"reference":"Patient/1"},'
                    b'"medicationCodeableConcept":{"text":"x"},"whenHandedOver":"2024-01-01",'
                    b'"quantity":{"value":1e308},"daysSupply":{"value":1e999}}\n'
                    b'{"resourceType":"MedicationDispense","subject":{"reference":"Patient/1"},'
                    b'"medicationCodeableConcept":{"text":"x"},"whenHandedOver":"2024-01-01",'
                    b'"quantity":{"value":18446744073709551616},"daysSupply":{"value":-1}}\n',
    "status_nested": b'{"resourceType":"MedicationDispense","status":' + nested(b"[", b"]", 2000) + b"}\n",
    "deep": nested(b"[", b"]", 20000) + b"\n",
    "structured": b'{"resourceType":"MedicationDispense","subject":{"reference":"Patient/1"},'
                  b'"medicationReference":{"reference":"#m"},"contained":[{"resourceType":"Medication",'
                  b'"id":"m","code":{"coding":[{"system":"ATC","code":"C08CA01"}]}}],'
                  b'"whenPrepared":"2024-01-01","quantity":{"value":100,"unit":"ml"},'
                  b'"dosageInstruction":[{"sequence":1,"timing":{"repeat":{"frequency":1e300,'
                  b'"period":1e-300,"periodUnit":"s"}},"doseAndRate":[{"doseQuantity":{"value":1e300,"unit":"ml"}}]}]}\n',
    "fixture_r4": (ROOT / "tests/data/fhir/dispensing_r4.ndjson").read_bytes(),
    "references": b'{"resourceType":"MedicationDispense","id":"a","status":"completed",'
                  b'"subject":{"reference":"Patient/../../X/_history/1"},"medicationCodeableConcept":{"text":"x"},'
                  b'"quantity":{"value":1},"whenHandedOver":"2024-01-01"}\n'
                  b'{"resourceType":"MedicationDispense","id":7,"status":"completed",'
                  b'"subject":{"identifier":{"system":"s","value":"v"}},"medicationReference":{"reference":"Medication/m"},'
                  b'"quantity":{"value":1,"code":"1"},"daysSupply":{"value":36,"code":"h"},"whenHandedOver":"2024-01-01"}\n'
                  b'{"fullUrl":"urn:uuid:7b1e4d2c-5a6f-4b3e-8c9d-0e1f2a3b4c5d","resource":{"resourceType":"Patient",'
                  b'"id":"p","identifier":[{"value":"v"}]}}\n'
                  b'{"resourceType":"Medication","id":"m","ingredient":[{"itemCodeableConcept":{"text":"x"},'
                  b'"strength":{"numerator":{"value":1e308,"unit":"ug"},"denominator":{"value":0,"unit":"mL"}}}]}\n',
}

DOSAGE = {
    "prn": b"1-2 tablets four times a day when required",
    "night": b"one at night",
    "ml_tds": b"5ml tds",
    "as_directed": b"as directed",
    "max": b"one or two puffs when required, max 8 in 24 hours",
    "weekly": b"take ONE tablet once a week on Monday",
    "huge": b"99999999999999999999999 tablets every 0.000000001 hours",
    "fractions": b"1/2 tablet bd \xc2\xbd tablet mane",
    "invalid_utf8": b"one \xff tablet \xc3\x28 daily",
    "nul": b"one\x00tablet daily",
    "fhir_dose": b'{"doseAndRate":[{"doseQuantity":{"value":1,"unit":"tablet"}}],'
                 b'"timing":{"repeat":{"frequency":2,"period":1,"periodUnit":"d"}}}',
    "fhir_range": b'{"doseAndRate":[{"doseRange":{"low":{"value":1},"high":{"value":2,"unit":"tablet"}}}],'
                  b'"timing":{"repeat":{"frequency":1,"frequencyMax":4,"period":4,"periodMax":6,"periodUnit":"h"}}}',
    "fhir_prn": b'{"asNeededBoolean":true,"maxDosePerPeriod":{"numerator":{"value":8},'
                b'"denominator":{"value":1,"unit":"d"}},"text":"1-2 puffs prn"}',
    "fhir_list": b'[{"sequence":1,"timing":{"code":{"coding":[{"code":"BID"}]}},'
                 b'"doseAndRate":[{"doseQuantity":{"value":1}}]},{"sequence":2,"timing":{"repeat":'
                 b'{"when":["MORN","NIGHT"]}},"doseAndRate":[{"doseQuantity":{"value":2}}]}]',
    "fhir_huge": b'{"doseAndRate":[{"doseQuantity":{"value":1e308}}],'
                 b'"timing":{"repeat":{"frequency":1e308,"period":1e-300,"periodUnit":"s"}}}',
    "fhir_types": b'{"doseAndRate":[{"doseQuantity":{"value":"1"}}],"timing":{"repeat":{"frequency":[],'
                  b'"period":{},"periodUnit":3,"when":"MORN"}},"asNeededBoolean":"yes"}',
    "deep": nested(b"[", b"]", 20000),
}

RESOLVER = {
    "tablet": b"Amlodipine 5mg tablets",
    "combination": b"Co-codamol 30mg/500mg tablets",
    "liquid": b"Oramorph 10mg/5ml oral solution",
    "patch": b"Buprenorphine 5micrograms/hour seven day transdermal patches",
    "percent": b"Hydrocortisone 1% cream 30g",
    "code": b"anything\nC08CA01\nATC",
    "code_uri": b"\nN02AJ06\nhttp://www.whocc.no/atc",
    "non_medicine": b"Sterile wound contact layer dressing 10cm x 10cm",
    "accents": b"CHLORPHENAMINE MALEATE 4MG TABLETS \xc2\xb5g \xce\xbcg Caf\xc3\xa9",
    "huge": b"Amlodipine 1e308mg/0.0000000000000000000001ml 99999999999999999999999999mg",
    "invalid_utf8": b"Amlo\xffdipine \xc3\x28 5mg\ncode\xff\nATC\xfe",
    "nul": b"Amlodipine\x005mg tablets",
    "units": b"Insulin glargine 100units/ml 3ml cartridge",
}

REPORT = {
    "demo": (ROOT / "demo-patients/network.json").read_bytes(),
    "minimal": b'{"title":"T","network":"N","criteria":["items>=10"]}',
    "bom": b'\xef\xbb\xbf{"title":"T","network":"N","criteria":["acb>=3","dbi>=1"],"on":"2024-03-31"}',
    "full": b'{"title":"T","network":"N","criteria":["items>=10"],"months":240,"suppress_below":1000,'
            b'"practices":["A","B"],"measure":"lookback","window":3660,"grace_days":0,"carryover":true,'
            b'"default_supply_days":1,"max_supply_days":3660,"count_by":"ingredient","exclude_prn":true,'
            b'"exclude_route":["topical","inhaled"],"scale":"acb","worklist_limit":100000,'
            b'"pseudonymise_key":"key.txt","digests":{"from":"a@b","to":["c@d"],"practice_to":{"A":["e@f"]},'
            b'"triggers":{"rise_patients":1,"rise_percent":0.5,"above_upper_limit":false}}}',
    "wrong_types": b'{"title":1,"network":[],"criteria":"items>=10","months":1.5}',
    "huge_numbers": b'{"title":"T","network":"N","criteria":["items>=10"],"months":18446744073709551615,'
                    b'"worklist_limit":-9223372036854775808,"digests":{"triggers":{"rise_percent":1e999}}}',
    "header_injection": b'{"title":"T","network":"N","criteria":["items>=10"],"digests":{"from":"a\\r\\nBcc: x"}}',
    "invalid_utf8": b'{"title":"T\xff","network":"N","criteria":["items>=10"]}',
    "nul": b'{"title":"T\x00","network":"N"}',
    "deep": b'{"title":"T","network":"N","criteria":["items>=10"],"scale":' + nested(b"[", b"]", 20000) + b"}",
    "unknown_key": b'{"title":"T","network":"N","criteria":["items>=10"],"titel":"x"}',
}


def write(target, files):
    folder = CORPUS / target
    folder.mkdir(parents=True, exist_ok=True)
    for name, data in files.items():
        (folder / name).write_bytes(data)


if __name__ == "__main__":
    shutil.rmtree(CORPUS, ignore_errors=True)
    write("csv_reader", CSV)
    write("fhir_reader", NDJSON)
    write("dosage_text", DOSAGE)
    write("resolver", RESOLVER)
    write("report_config", REPORT)
    total = sum(p.stat().st_size for p in CORPUS.rglob("*") if p.is_file())
    print(f"{total} bytes in {sum(1 for p in CORPUS.rglob('*') if p.is_file())} files")

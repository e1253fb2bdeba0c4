#!/usr/bin/env python3
"""A second data shape for tests/perf/compare.sh, unlike `medload synth`'s: weekly and
fortnightly dispensing of many medicines to fewer, older patients (about 400 rows a
patient a year), columns in another order with extra ones medload ignores, a days supply
on one row in five (the rest left to the dosage text), free-text dosage written many ways,
and products made from every ingredient of the formulary with varied strengths and forms.
Invented data only. For people measuring; nothing here is committed but the script.

    tests/perf/weekly_shape.py --rows N --out DIR [--seed S] [--formulary DIR]
"""
import argparse
import csv
import datetime
import os
import random

FORMS = ["tablets", "capsules", "modified-release tablets", "film-coated tablets",
         "dispersible tablets", "oral solution", "gastro-resistant tablets", "orodispersible tablets"]
STRENGTHS = ["1mg", "2mg", "2.5mg", "5mg", "10mg", "20mg", "25mg", "40mg", "50mg", "75mg",
             "100mg", "150mg", "200mg", "250mg", "500mg", "5mg/5ml", "10mg/5ml", "250mg/5ml"]
FREQUENCIES = [("od", 1), ("bd", 2), ("tds", 3), ("qds", 4), ("nocte", 1), ("mane", 1),
               ("once a day", 1), ("twice a day", 2), ("three times a day", 3),
               ("four times daily", 4), ("every morning", 1), ("at night", 1),
               ("in the morning and at teatime", 2), ("ONCE DAILY", 1), ("twice daily", 2)]
AMOUNTS = [("one", 1), ("1", 1), ("two", 2), ("2", 2), ("half a", 0.5), ("ONE", 1), ("1-2", 2)]
EXTRAS = ["", "", " with food", " after breakfast", " for blood pressure", " for cholesterol",
          " (blister pack)", " swallow whole", " do not crush", " with plenty of water",
          " for pain", " when required", " when required max 8 in 24 hours", " as directed",
          " until review", " for 7 days then review", " - dose changed, see letter"]
PRACTICES = [("HM%02d" % i, "Harrowmere Surgery %d (invented)" % i) for i in range(1, 9)]
NETWORK = "Harrowmere Care Network (invented)"
LAST_DAY = datetime.date(2026, 10, 31)
DAYS = 365


def ingredients(formulary):
    with open(os.path.join(formulary, "ingredients.csv"), newline="") as f:
        return [row["ingredient"] for row in csv.DictReader(f)]


def dosage(rng, unit_word):
    amount, per_dose = rng.choice(AMOUNTS)
    frequency, times = rng.choice(FREQUENCIES)
    if unit_word == "ml":
        text = "%sml %s" % (rng.choice(["5", "10", "2.5", "15"]), frequency)
        return text + rng.choice(EXTRAS), 1 * times
    verb = rng.choice(["take ", "Take ", "", "TAKE "])
    word = rng.choice(["tablet", "tab", "capsule", "cap", "dose"]) + ("s" if per_dose > 1 else "")
    return "%s%s %s %s%s" % (verb, amount, word, frequency, rng.choice(EXTRAS)), per_dose * times


def patient_rows(rng, patient, practice, products, next_id):
    medicines = rng.sample(products, rng.randint(6, 18))
    interval = rng.choice([7, 7, 7, 14, 28])
    start = LAST_DAY - datetime.timedelta(days=DAYS - 1 - rng.randint(0, interval - 1))
    rows = []
    for product in medicines:
        unit = "ml" if "solution" in product else "tablet"
        text, per_day = dosage(rng, unit)
        day = start
        while day <= LAST_DAY:
            quantity = max(1, round(per_day * interval * (10 if unit == "ml" else 1)))
            supply = str(interval) if rng.random() < 0.2 else ""
            next_id += 1
            rows.append([day.isoformat(), patient, "FP%04d" % rng.randint(1, 300), product, quantity, unit,
                         text, practice, "HX-%d" % next_id, supply, "GMC%05d" % rng.randint(1, 900),
                         rng.choice(["exempt", "paid", "prepaid"])])
            day += datetime.timedelta(days=interval + rng.choice([0, 0, 0, -1, 1, 2]))
    return rows, next_id


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--rows", type=int, required=True)
    parser.add_argument("--out", required=True)
    parser.add_argument("--seed", type=int, default=11)
    parser.add_argument("--formulary", default=os.path.join(os.path.dirname(__file__), "..", "..", "formulary"))
    args = parser.parse_args()
    rng = random.Random(args.seed)
    products = ["%s %s %s" % (name.capitalize(), rng.choice(STRENGTHS), rng.choice(FORMS))
                for name in ingredients(args.formulary) for _ in range(3)]
    os.makedirs(args.out, exist_ok=True)
    with open(os.path.join(args.out, "practices.csv"), "w", newline="") as f:
        out = csv.writer(f, lineterminator="\n")
        out.writerow(["Network", "Practice", "List Size", "Name"])
        for code, name in PRACTICES:
            out.writerow([NETWORK, code, 6000, name])
    dispensing = open(os.path.join(args.out, "dispensing.csv"), "w", newline="")
    patients = open(os.path.join(args.out, "patients.csv"), "w", newline="")
    rows_out = csv.writer(dispensing, lineterminator="\n")
    patients_out = csv.writer(patients, lineterminator="\n")
    rows_out.writerow(["Dispensed On", "Patient ID", "Pharmacy", "Product", "Quantity", "Unit", "Dosage",
                       "Practice", "Record ID", "Days Supply", "Prescriber", "Charge Status"])
    patients_out.writerow(["Practice", "Patient ID", "Sex", "Birth Date", "Postcode Sector",
                           "Registered From", "Registered To"])
    written, next_id, number = 0, 0, 0
    while written < args.rows:
        number += 1
        patient, practice = "HP%07d" % number, rng.choice(PRACTICES)[0]
        born = datetime.date(rng.randint(1926, 1966), rng.randint(1, 12), rng.randint(1, 28))
        patients_out.writerow([practice, patient, rng.choice(["F", "M"]), born.isoformat(),
                               "XX%d %d" % (rng.randint(1, 20), rng.randint(1, 9)),
                               datetime.date(rng.randint(1990, 2024), 1, 1).isoformat(), ""])
        rows, next_id = patient_rows(rng, patient, practice, products, next_id)
        rows.sort(key=lambda row: row[0])
        rows_out.writerows(rows)
        written += len(rows)
    dispensing.close()
    patients.close()
    with open(os.path.join(args.out, "reviews.csv"), "w", newline="") as f:
        out = csv.writer(f, lineterminator="\n")
        out.writerow(["Reviewed On", "Patient ID"])
        for n in range(1, number + 1, 7):
            out.writerow([(LAST_DAY - datetime.timedelta(days=rng.randint(0, 700))).isoformat(), "HP%07d" % n])
    print("%d dispensing rows, %d patients, %d distinct products in %s" % (written, number, len(set(products)), args.out))


if __name__ == "__main__":
    main()

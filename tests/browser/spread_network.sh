#!/usr/bin/env bash
# Makes a larger invented network for the browser check from the demo data: the demo's
# patients spread over N practices of uneven size (codes NW01..NWnn, invented names), their
# dispensing lines moved with them. Deterministic: the same N gives the same files.
#   usage: spread_network.sh DEMO_DATA_FOLDER OUTPUT_FOLDER N
set -eu
src=$1
dest=$2
n=$3
mkdir -p "$dest"
awk -F, -v n="$n" 'BEGIN {
    OFS = ",";
    split("Alder Birch Cedar Damson Elder Fennel Gorse Hazel Ivy Juniper Larch Maple Nettle Oak Poplar Rowan Sorrel Teasel Willow Yarrow", tree, " ");
    split("Road|Lane|Green|Street|Hill|Row|Park|Close|Way|Square|Rise|Gate|Bank|Court|Mews|Croft|Fold|Yard|End|Walk", place, "|");
    split("Surgery|Medical Centre|Health Centre|Practice|Family Practice", kind, "|");
    print "practice,name,network,list_size";
    for (p = 1; p <= n; p++) {
      name = tree[(p - 1) % 20 + 1] " " place[(p * 7) % 20 + 1] " " kind[p % 5 + 1];
      if (p == 7) name = name " & Branch Site at the Old Mill";
      printf "NW%02d,%s,Wrenfold Vale Care Network,\n", p, name;
    }
  }' /dev/null >"$dest/practices.csv"
# A patient's practice: the r-th patient row goes to practice 1 + floor(n * u^1.6) with u a
# fixed scramble of r in [0, 1): practices with low codes get more patients.
awk -F, -v n="$n" 'BEGIN { OFS = "," }
  NR == 1 { print; next }
  { u = ((NR * 7919) % 1009) / 1009; p = 1 + int(n * u ^ 1.6); if (p > n) p = n;
    $4 = sprintf("NW%02d", p); print }' "$src/patients.csv" >"$dest/patients.csv"
awk -F, 'BEGIN { OFS = "," }
  FNR == NR { if (FNR > 1) practice[$1] = $4; next }
  FNR == 1 { print; next }
  { $3 = ($2 in practice) ? practice[$2] : "NW01"; print }' "$dest/patients.csv" "$src/dispensing.csv" >"$dest/dispensing.csv"
cp "$src/reviews.csv" "$dest/reviews.csv"
# The demo's config, with counts shown from 1 (small practices would otherwise show little).
sed -e 's/"WV001"/"NW01"/' -e 's/"suppress_below": [0-9]*/"suppress_below": 0/' "$src/network.json" >"$dest/network.json"

// Layout check run inside a report page by tests/browser/check_report.sh (appended to a
// copy of the page). With "#print" in the address the page's @media print rules are applied
// to the screen first, so that a window as wide as an A4 page's printable area shows the
// printed layout. It then looks for text of a chart that overlaps other text of that chart
// or leaves it, a page wider than the window, and tables wider than the page, and writes
// what it found into a pre element (id layout-check) for --dump-dom to show. The script's
// own text must not hold that element's markup or its last line, which the caller looks for.
(function () {
  if (location.hash === '#print') {
    const printed = document.createElement('style');
    for (const sheet of document.styleSheets) {
      for (const rule of sheet.cssRules) {
        if (rule instanceof CSSMediaRule && rule.media.mediaText.includes('print')) {
          for (const inner of rule.cssRules) printed.textContent += inner.cssText + '\n';
        }
      }
    }
    document.head.appendChild(printed);
  }
  const faults = [];
  let texts = 0;
  const tolerance = 0.5;  // px: anti-aliasing, not overlap
  document.querySelectorAll('svg').forEach((svg, index) => {
    const frame = svg.getBoundingClientRect();
    const boxes = [...svg.querySelectorAll('text')].map((t) => ({text: t.textContent, r: t.getBoundingClientRect()}));
    texts += boxes.length;
    for (const a of boxes) {
      if (a.r.left < frame.left - tolerance || a.r.right > frame.right + tolerance ||
          a.r.top < frame.top - tolerance || a.r.bottom > frame.bottom + tolerance) {
        faults.push('chart ' + index + ': "' + a.text + '" reaches outside the chart');
      }
    }
    for (let i = 0; i < boxes.length; i++) {
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i].r;
        const b = boxes[j].r;
        if (a.left < b.right - tolerance && b.left < a.right - tolerance &&
            a.top < b.bottom - tolerance && b.top < a.bottom - tolerance) {
          faults.push('chart ' + index + ': "' + boxes[i].text + '" overlaps "' + boxes[j].text + '"');
        }
      }
    }
  });
  const page = document.documentElement.scrollWidth;
  if (page > window.innerWidth) faults.push('the page is ' + page + ' px wide in a ' + window.innerWidth + ' px window');
  document.querySelectorAll('table').forEach((table, index) => {
    const room = table.parentElement.clientWidth;
    if (table.getBoundingClientRect().width > room + tolerance) {
      faults.push('table ' + index + ' is ' + Math.round(table.getBoundingClientRect().width) + ' px wide in ' + room + ' px');
    }
  });
  const out = document.createElement('pre');
  out.id = 'layout-check';
  out.textContent = 'charts ' + document.querySelectorAll('svg').length + ', texts ' + texts + ', faults ' +
                    faults.length + '\n' + faults.slice(0, 40).join('\n') + '\nend of layout ' + 'check';
  document.body.appendChild(out);
})();

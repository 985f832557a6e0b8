// The stand-in's own small page: the conversation so far, a form to play a patient's reply, and the
// fault switches. Plain HTML with a little inline script that reads the /fake/* JSON every 2 s.

const STYLE = `
  :root { --teal: #0b4f4a; --teal-light: #e3f1ef; --ink: #1d2a2a; --muted: #5f6f6e; --line: #d9e2e1; }
  * { box-sizing: border-box; }
  body { margin: 0; font: 14px/1.45 system-ui, -apple-system, "Segoe UI", sans-serif; color: var(--ink); background: #fff; }
  header { background: var(--teal); color: #fff; padding: 14px 24px; display: flex; align-items: baseline; gap: 16px; flex-wrap: wrap; }
  header h1 { margin: 0; font-size: 19px; font-weight: 600; letter-spacing: .2px; }
  header .meta { font-size: 12px; opacity: .85; }
  .notice { background: var(--teal-light); border-bottom: 1px solid var(--line); padding: 8px 24px; font-size: 13px; }
  main { display: grid; grid-template-columns: minmax(0, 1fr) 300px; gap: 24px; padding: 18px 24px 32px; }
  @media (max-width: 900px) { main { grid-template-columns: 1fr; } }
  h2 { font-size: 14px; margin: 0 0 8px; text-transform: uppercase; letter-spacing: .6px; color: var(--muted); }
  table { width: 100%; border-collapse: collapse; }
  th, td { text-align: left; padding: 7px 8px; border-bottom: 1px solid var(--line); vertical-align: top; }
  th { font-size: 12px; color: var(--muted); font-weight: 600; }
  td.body { white-space: pre-wrap; word-break: break-word; max-width: 420px; }
  td.time, td.num { white-space: nowrap; font-variant-numeric: tabular-nums; }
  tr.inbound td { background: #f6faf9; }
  .dir { font-size: 12px; font-weight: 600; }
  .dir.out { color: var(--teal); } .dir.in { color: #7a4b00; }
  .pill { display: inline-block; padding: 1px 8px; border-radius: 10px; font-size: 12px; background: #eef1f1; }
  .pill.delivered, .pill.received { background: #d9efe6; color: #135c3b; }
  .pill.sent, .pill.queued { background: #e7eef7; color: #274b7a; }
  .pill.failed, .pill.undelivered { background: #f8e0de; color: #8a2119; }
  .sub { font-size: 11px; color: var(--muted); }
  .empty { color: var(--muted); padding: 18px 8px; }
  aside section { border: 1px solid var(--line); border-radius: 6px; padding: 12px; margin-bottom: 16px; }
  label { display: block; font-size: 12px; color: var(--muted); margin: 6px 0 2px; }
  input, select, textarea { width: 100%; font: inherit; padding: 6px 8px; border: 1px solid #b9c7c5; border-radius: 4px; }
  textarea { min-height: 64px; resize: vertical; }
  .row { display: flex; gap: 8px; } .row > * { flex: 1; }
  button { margin-top: 10px; font: inherit; padding: 6px 12px; border-radius: 4px; border: 1px solid var(--teal); background: var(--teal); color: #fff; cursor: pointer; }
  button.plain { background: #fff; color: var(--teal); }
  .result { font-size: 12px; margin-top: 8px; min-height: 1em; white-space: pre-wrap; word-break: break-word; }
  .stats { font-size: 12px; color: var(--muted); }
`;

const SCRIPT = `
  var zone = 'America/New_York';
  function el(tag, cls, text) { var e = document.createElement(tag); if (cls) e.className = cls; if (text != null) e.textContent = text; return e; }
  function time(iso) { return new Date(iso).toLocaleString('en-US', { timeZone: zone, month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', second: '2-digit', hour12: false }); }
  function dirLabel(d) { return d === 'inbound' ? 'in' : d === 'outbound-reply' ? 'out (markup reply)' : 'out'; }
  function api(method, path, body) {
    return fetch(path, { method: method, headers: body ? { 'Content-Type': 'application/json' } : {}, body: body ? JSON.stringify(body) : undefined })
      .then(function (r) { return r.status === 204 ? {} : r.json().then(function (j) { if (!r.ok) throw new Error(j.message || ('HTTP ' + r.status)); return j; }); });
  }
  function render(list) {
    var tbody = document.getElementById('rows');
    tbody.textContent = '';
    document.getElementById('empty').style.display = list.length ? 'none' : '';
    list.slice().reverse().forEach(function (m) {
      var tr = el('tr', m.direction === 'inbound' ? 'inbound' : '');
      tr.appendChild(el('td', 'time', time(m.dateCreated)));
      tr.appendChild(el('td', 'dir ' + (m.direction === 'inbound' ? 'in' : 'out'), dirLabel(m.direction)));
      tr.appendChild(el('td', 'num', m.from || '—'));
      tr.appendChild(el('td', 'num', m.to));
      tr.appendChild(el('td', 'body', m.body));
      var st = el('td');
      st.appendChild(el('span', 'pill ' + m.status, m.status));
      if (m.errorCode) st.appendChild(el('div', 'sub', 'error ' + m.errorCode));
      var cbs = m.callbacks || [];
      if (cbs.length) {
        var last = cbs[cbs.length - 1];
        st.appendChild(el('div', 'sub', 'callback ' + last.status + ' → ' + (last.httpStatus != null ? 'HTTP ' + last.httpStatus : (last.error || 'no answer'))));
      }
      if (m.webhook) st.appendChild(el('div', 'sub', 'webhook → ' + (m.webhook.httpStatus != null ? 'HTTP ' + m.webhook.httpStatus : (m.webhook.error || 'no answer')) + (m.webhook.signedWith === 'other' ? ' (wrong signature)' : '')));
      tr.appendChild(st);
      tbody.appendChild(tr);
    });
    var lastOut = list.filter(function (m) { return m.direction !== 'inbound'; }).pop();
    var from = document.getElementById('reply-from');
    if (lastOut && !from.dataset.touched) from.value = lastOut.to;
  }
  function refresh() {
    Promise.all([api('GET', '/fake/messages'), api('GET', '/fake/stats'), api('GET', '/fake/info')]).then(function (r) {
      render(r[0]);
      var s = r[1], i = r[2];
      var by = Object.keys(s.byStatus).map(function (k) { return k + ' ' + s.byStatus[k]; }).join(', ');
      document.getElementById('stats').textContent = 'accepted ' + s.accepted + ' · refused ' + s.refused + ' · inbound ' + s.inbound + (by ? ' · ' + by : '');
      var f = i.fault;
      document.getElementById('fault-now').textContent = f ? ('Active: ' + f.mode + (f.remaining != null ? ', ' + f.remaining + ' request(s) left' : '') + (f.until ? ', until ' + time(f.until) : '') + ' (hit ' + f.hits + ')') : 'No fault: sends are answered normally.';
      document.getElementById('inbound-url').textContent = i.inboundUrl || 'not configured (give one below)';
    }).catch(function (e) { document.getElementById('stats').textContent = 'stand-in not answering: ' + e.message; });
  }
  document.getElementById('reply-from').addEventListener('input', function (e) { e.target.dataset.touched = '1'; });
  document.getElementById('reply').addEventListener('submit', function (e) {
    e.preventDefault();
    var out = document.getElementById('reply-result');
    var body = { from: document.getElementById('reply-from').value.trim(), body: document.getElementById('reply-body').value };
    var url = document.getElementById('reply-url').value.trim();
    if (url) body.url = url;
    out.textContent = 'posting…';
    api('POST', '/fake/reply', body).then(function (r) {
      out.textContent = 'Webhook answered HTTP ' + r.status + (r.body ? ':\\n' + r.body.slice(0, 300) : '');
      document.getElementById('reply-body').value = '';
      refresh();
    }).catch(function (err) { out.textContent = err.message; });
  });
  document.getElementById('fault').addEventListener('submit', function (e) {
    e.preventDefault();
    var spec = { mode: document.getElementById('fault-mode').value };
    var count = document.getElementById('fault-count').value, forMs = document.getElementById('fault-for').value, delay = document.getElementById('fault-delay').value;
    if (count) spec.count = Number(count);
    if (forMs) spec.forMs = Number(forMs);
    if (delay) spec.delayMs = Number(delay);
    api('POST', '/fake/faults', spec).then(refresh).catch(function (err) { document.getElementById('fault-now').textContent = err.message; });
  });
  document.getElementById('fault-clear').addEventListener('click', function () { api('DELETE', '/fake/faults').then(refresh); });
  document.getElementById('forget').addEventListener('click', function () { api('DELETE', '/fake/messages').then(refresh); });
  refresh();
  setInterval(refresh, 2000);
`;

export function renderPage(): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Ostium SMS stand-in</title>
<style>${STYLE}</style>
</head>
<body>
<header><h1>Ostium SMS stand-in</h1><span class="meta">local development stand-in for the text-messaging provider</span></header>
<div class="notice"><strong>Development stand-in.</strong> Nothing leaves this machine: no text reaches a phone. Messages the app sends are recorded here, delivery statuses are simulated, and replies below are played to the app's inbound webhook (<span id="inbound-url"></span>). Times in New York time.</div>
<main>
  <div>
    <h2>Messages, newest first</h2>
    <div class="stats" id="stats"></div>
    <table>
      <thead><tr><th>Time</th><th>Direction</th><th>From</th><th>To</th><th>Text</th><th>Status</th></tr></thead>
      <tbody id="rows"></tbody>
    </table>
    <div class="empty" id="empty">No messages yet.</div>
  </div>
  <aside>
    <section>
      <h2>Play a patient's reply</h2>
      <form id="reply">
        <label for="reply-from">From (the patient's number)</label>
        <input id="reply-from" value="+12025550142" autocomplete="off">
        <label for="reply-body">Text</label>
        <textarea id="reply-body" placeholder="C to confirm, R to reschedule, STOP…"></textarea>
        <label for="reply-url">Webhook URL (optional, overrides the configured one)</label>
        <input id="reply-url" placeholder="http://127.0.0.1:3000/api/sms/inbound" autocomplete="off">
        <button type="submit">Send reply to the app</button>
      </form>
      <div class="result" id="reply-result"></div>
    </section>
    <section>
      <h2>Faults on sending</h2>
      <form id="fault">
        <label for="fault-mode">Mode</label>
        <select id="fault-mode">
          <option value="http500">HTTP 500 (nothing recorded)</option>
          <option value="timeout">Timeout (no answer)</option>
          <option value="slow">Slow answer (recorded)</option>
        </select>
        <div class="row">
          <div><label for="fault-count">Requests</label><input id="fault-count" type="number" min="1" placeholder="all"></div>
          <div><label for="fault-for">For ms</label><input id="fault-for" type="number" min="1" placeholder="—"></div>
          <div><label for="fault-delay">Delay ms</label><input id="fault-delay" type="number" min="0" placeholder="2000"></div>
        </div>
        <button type="submit">Set fault</button>
        <button type="button" class="plain" id="fault-clear">Clear fault</button>
      </form>
      <div class="result" id="fault-now"></div>
    </section>
    <section>
      <h2>Recorded messages</h2>
      <button type="button" class="plain" id="forget">Forget all messages</button>
    </section>
  </aside>
</main>
<script>${SCRIPT}</script>
</body>
</html>`;
}

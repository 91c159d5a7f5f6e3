// Renders openapi.json as a readable list of operations, grouped by tag. Self-contained: no library,
// no outside address, and nothing inline (the page runs under a strict Content Security Policy).
(async function main() {
  const root = document.getElementById('reference');
  const el = (tag, text, className) => {
    const node = document.createElement(tag);
    if (text !== undefined) node.textContent = text;
    if (className) node.className = className;
    return node;
  };
  const block = (title, value) => {
    const wrap = el('div');
    wrap.append(el('h4', title), el('pre', JSON.stringify(value, null, 2)));
    return wrap;
  };
  let doc;
  try {
    const response = await fetch('openapi.json', { headers: { Accept: 'application/json' } });
    doc = await response.json();
  } catch {
    root.replaceChildren(el('p', 'The API description could not be loaded.'));
    return;
  }
  const byTag = new Map();
  for (const [path, item] of Object.entries(doc.paths)) {
    for (const [method, op] of Object.entries(item)) {
      const tag = (op.tags && op.tags[0]) || 'Other';
      if (!byTag.has(tag)) byTag.set(tag, []);
      byTag.get(tag).push({ path, method, op });
    }
  }
  const sections = [];
  for (const [tag, ops] of byTag) {
    const section = el('section');
    section.append(el('h2', tag));
    for (const { path, method, op } of ops) {
      const details = el('details');
      const summary = el('summary');
      const auth = op.security && op.security.length ? 'sign-in required' : 'public';
      summary.append(
        el('span', method.toUpperCase(), 'method'),
        el('span', path, 'path'),
        el('span', `${op.summary || ''} · ${auth}`, 'auth'),
      );
      details.append(summary);
      if (op.parameters && op.parameters.length) details.append(block('Parameters', op.parameters));
      if (op.requestBody) details.append(block('Request body', op.requestBody.content));
      details.append(block('Responses', op.responses));
      section.append(details);
    }
    sections.push(section);
  }
  root.replaceChildren(
    el('p', `${doc.info.title}, version ${doc.info.version}. ${doc.info.description || ''}`),
    ...sections,
  );
})();

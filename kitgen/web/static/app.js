// kitgen serve (#13): what JavaScript adds to a page that works without it.
// - the plate and rete preview follows the fields (debounced fetch);
// - suggestions from the gazetteer as one types a place (an ARIA 1.2
//   combobox: arrow keys, Enter, Escape);
// - the PDF's pages as pictures before download;
// - a class set's progress.
// Every word shown comes from the page (data-* attributes), which has it from
// the language templates.
"use strict";

(function () {
  const DEBOUNCE_MS = 150;      // the preview follows within half a second
  const SEARCH_MS = 150;

  function debounce(fn, ms) {
    let timer = null;
    return function () { clearTimeout(timer); timer = setTimeout(fn, ms); };
  }

  function formBody(form) {
    const data = new FormData(form);
    data.delete("roster");
    data.delete("format");
    return new URLSearchParams(data);
  }

  function csrf(form) { return form.elements["csrf_token"].value; }

  function post(form, url, signal) {
    return fetch(url, {
      method: "POST", body: formBody(form), signal: signal, credentials: "same-origin",
      headers: { "Accept": "application/json", "X-CSRF-Token": csrf(form) },
    });
  }

  function showErrors(form, errors) {
    form.querySelectorAll(".error[id^='error-']").forEach(function (p) {
      const name = p.id.slice(6);
      const message = errors[name] || "";
      p.textContent = message;
      p.hidden = !message;
      const field = document.getElementById("field-" + name);
      if (field) {
        field.classList.toggle("has-error", !!message);
        field.querySelectorAll("input, select").forEach(function (el) {
          if (message) { el.setAttribute("aria-invalid", "true"); } else { el.removeAttribute("aria-invalid"); }
        });
      }
    });
  }

  function setupPreview(form) {
    const section = document.getElementById("preview");
    const status = document.getElementById("preview-status");
    let controller = null;
    let asked = 0;

    function update() {
      if (controller) { controller.abort(); }
      controller = new AbortController();
      const started = performance.now();
      const ticket = ++asked;
      status.textContent = form.dataset.updating;
      section.setAttribute("aria-busy", "true");
      post(form, "/api/preview" + location.search, controller.signal).then(function (response) {
        return response.json().then(function (body) { return [response, body]; });
      }).then(function ([response, body]) {
        if (ticket !== asked) { return; }
        section.setAttribute("aria-busy", "false");
        showErrors(form, body.errors || {});
        if (!body.ok) {
          status.textContent = response.status === 503 ? form.dataset.busy : "";
          return;
        }
        status.textContent = "";
        for (const name of ["plate", "rete"]) {
          const holder = document.querySelector("#preview-" + name + " .svg");
          holder.innerHTML = body.svgs[name] || "";
        }
        const notes = document.getElementById("preview-notes");
        notes.replaceChildren(...body.notes.map(function (n) {
          const li = document.createElement("li"); li.textContent = n; return li;
        }));
        // The time from the change to the drawing in the page, for the tests.
        section.dataset.latencyMs = String(Math.round(performance.now() - started + DEBOUNCE_MS));
        section.dataset.updates = String(Number(section.dataset.updates || 0) + 1);
      }).catch(function (err) {
        if (err.name !== "AbortError") { status.textContent = form.dataset.busy; }
      });
    }

    const later = debounce(update, DEBOUNCE_MS);
    form.addEventListener("input", function (ev) { if (ev.target.name !== "roster") { later(); } });
    form.addEventListener("change", function (ev) { if (ev.target.name !== "roster") { later(); } });
    // A page given back with values (no JavaScript's preview, a mistake)
    // is drawn at once; an empty form waits for the first change.
    if (form.elements["latitude"].value || (form.elements["place"] && form.elements["place"].value)) { update(); }
  }

  function setupPages(form) {
    const button = document.getElementById("show-pages");
    const box = document.getElementById("pages");
    button.hidden = false;
    button.addEventListener("click", function () {
      box.textContent = form.dataset.updating;
      post(form, "/api/pages" + location.search).then(function (r) { return r.json(); }).then(function (body) {
        showErrors(form, body.errors || {});
        if (!body.ok) { box.textContent = body.busy ? form.dataset.busy : ""; return; }
        box.replaceChildren(...body.pages.map(function (src, k) {
          const img = document.createElement("img");
          img.src = src;
          img.alt = form.dataset.pageAlt.replace("{k}", k + 1).replace("{n}", body.pages.length);
          return img;
        }));
      });
    });
  }

  function setupPlaces(form) {
    const input = document.getElementById("f-place");
    const list = document.getElementById("place-list");
    if (!input || !list) { return; }
    let found = [];
    let active = -1;

    function close() {
      list.hidden = true; input.setAttribute("aria-expanded", "false");
      input.removeAttribute("aria-activedescendant"); active = -1;
    }

    function mark(k) {
      active = k;
      list.querySelectorAll("li").forEach(function (li, j) { li.setAttribute("aria-selected", String(j === k)); });
      if (k >= 0 && list.children[k]) {
        input.setAttribute("aria-activedescendant", list.children[k].id);
        list.children[k].scrollIntoView({ block: "nearest" });
      }
    }

    function setField(name, value) {
      const el = form.elements[name];
      if (el && value !== undefined && value !== null) { el.value = String(value); }
    }

    function choose(k) {
      const p = found[k];
      if (!p) { return; }
      setField("place", p.name);
      setField("latitude", p.latitude);
      setField("longitude", p.longitude);
      setField("timezone", p.timezone);
      input.dataset.picked = "1";
      close();
      form.dispatchEvent(new Event("change"));
    }

    function show(places) {
      found = places;
      list.replaceChildren(...places.map(function (p, k) {
        const li = document.createElement("li");
        li.id = "place-" + k;
        li.setAttribute("role", "option");
        li.setAttribute("aria-selected", "false");
        li.textContent = p.label;   // the shortest query that names it: "Lisbon, PT"
        li.addEventListener("mousedown", function (ev) { ev.preventDefault(); choose(k); });
        return li;
      }));
      if (!places.length) {
        const li = document.createElement("li");
        li.setAttribute("role", "option"); li.setAttribute("aria-disabled", "true");
        li.textContent = form.dataset.noPlaces;
        list.appendChild(li);
      }
      list.hidden = false; input.setAttribute("aria-expanded", "true"); active = -1;
    }

    const search = debounce(function () {
      const q = input.value.trim();
      if (!q) { close(); return; }
      fetch("/api/places?q=" + encodeURIComponent(q), { headers: { "Accept": "application/json" } })
        .then(function (r) { return r.json(); })
        .then(function (body) { if (input.value.trim() === q) { show(body.places || []); } });
    }, SEARCH_MS);

    input.addEventListener("input", function () {
      // Coordinates that came with a picked place go when the place changes,
      // so that a plate is never drawn for the town typed before.
      if (input.dataset.picked) {
        for (const name of ["latitude", "longitude", "timezone"]) { setField(name, ""); }
        delete input.dataset.picked;
      }
      search();
    });
    input.addEventListener("keydown", function (ev) {
      if (list.hidden) { return; }
      if (ev.key === "ArrowDown") { ev.preventDefault(); mark(Math.min(active + 1, found.length - 1)); }
      else if (ev.key === "ArrowUp") { ev.preventDefault(); mark(Math.max(active - 1, 0)); }
      else if (ev.key === "Enter" && active >= 0) { ev.preventDefault(); choose(active); }
      else if (ev.key === "Escape") { ev.preventDefault(); close(); }
    });
    input.addEventListener("blur", close);
  }

  function setupSet() {
    const box = document.getElementById("set-status");
    if (!box || box.dataset.state !== "running") { return; }
    const bar = document.getElementById("set-progress");
    const text = document.getElementById("set-text");
    const link = document.getElementById("set-download");
    const timer = setInterval(function () {
      fetch(box.dataset.status, { headers: { "Accept": "application/json" } })
        .then(function (r) { return r.json(); })
        .then(function (s) {
          bar.max = s.total || 1; bar.value = s.done || 0;
          text.textContent = s.text || "";
          box.dataset.state = s.state;
          if (s.state !== "running") {
            clearInterval(timer);
            if (s.state === "done") { bar.value = bar.max; link.hidden = false; }
          }
        });
    }, 700);
  }

  // The page's language switch keeps what was typed: the fields go along in
  // the address (their names are the recipe keys), the kit's language with
  // the page's.
  function setupLanguageLinks(form) {
    document.querySelectorAll("nav a[hreflang]").forEach(function (a) {
      a.addEventListener("click", function (ev) {
        const query = formBody(form);
        query.delete("csrf_token");
        for (const [name, value] of [...query.entries()]) {
          if (value === "") { query.delete(name, value); }
        }
        query.set("language", a.hreflang);
        query.set("lang", a.hreflang);
        ev.preventDefault();
        location.assign("/?" + query.toString());
      });
    });
  }

  document.addEventListener("DOMContentLoaded", function () {
    const form = document.getElementById("kit");
    if (form) {
      setupLanguageLinks(form);
      setupPreview(form);
      setupPages(form);
      setupPlaces(form);
    }
    setupSet();
  });
})();

// Notes: the engine's notes on figures it left out, with their report path.
import { el } from "./dom.js";
import { addCard, card } from "./card-kit.js";

function notesCard(rep) {
  if (!rep.notes || !rep.notes.length) return null;
  return card("notes", "Notes", el("ul", null, ...rep.notes.map((n) => el("li", null, el("code", { text: n.field }), " " + n.text))));
}

addCard("notes", notesCard);

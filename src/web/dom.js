// Element look-up shared by the page's modules.

/** The page's element with this id (null when there is none). */
export const byId = (id) => document.getElementById(id);

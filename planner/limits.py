"""How much one web request may ask for: the caps the page forms check before anything heavy runs.

Every request that starts a computation (a spectrum, a plan, a fit, an upload)
is bounded so that no single request can hold a server worker for minutes or
fill its memory.  The caps that are not here live beside what they guard:

* ``planner.engine.request``: temperature (``MAX_TEMPERATURE_K``) and the hard
  J caps (``ASYMMETRIC_J_CAP``, ``CLOSED_FORM_J_CAP``); ``planner.engine.ladder``
  refuses a request that would climb past them before diagonalising anything.
* ``planner.catalogue.page_forms.MAX_TEMPERATURES`` (the species page's Q(T) list),
  ``planner.planning.forms.MAX_SPECIES`` (species of one plan),
  ``planner.engine.scanplan.choose_segments`` (the solver's own time limit) and
  ``planner.catalogue.levels_plot.DIAGRAM_J_MAX`` (the level diagram).

Django's own DATA_UPLOAD_MAX_MEMORY_SIZE and FILE_UPLOAD_MAX_MEMORY_SIZE (settings.py) stay above
the upload caps here, so an accepted file is read in memory and a bigger one reaches its form,
which refuses it with a message next to the field (tests/web/test_upload_limits.py checks this).
"""

from __future__ import annotations

from planner.engine.request import CLOSED_FORM_J_CAP

#: Highest upper window edge of the spectrum page and its downloads [MHz] (3 THz).  Pure rotational
#: lines of the catalogue's molecules that microwave and mm-wave instruments reach lie far below it
#: (common practice, no source); measured on the 2-core machine (2026-12-02), a 10 THz window of
#: the demo's c-C2H4O at 1000 K took 5 s against 0.7 s for 1 THz, so the edge bounds the work.
MAX_FREQUENCY_MHZ = 3_000_000.0

#: Widest window of one plan [MHz] (300 GHz).  A slot scans one receiver band, and bands in common
#: use are far narrower (common practice, no source); measured on the 2-core machine (2026-12-02),
#: a plan of all 20 demo species took 12–15 s over 100 GHz and 13–25 s over 300 GHz.
MAX_PLAN_SPAN_MHZ = 300_000.0

#: Most instrument settings (window span / setting width) one plan may cut its window into.  Scan
#: segments are split at the setting width, so a narrow-band instrument over a wide window makes
#: very many candidates: measured on the 2-core machine (2026-12-02), all 20 demo species over
#: 40 GHz took 22 s and 168 MB with 1 MHz settings (40 000) but 34 s and 741 MB with 0.01 MHz.
MAX_PLAN_SETTINGS = 20_000

#: Most assigned lines one fit may take.  A thorough assignment of one state is a few thousand
#: lines (common practice, no source); the Jacobian and every Gauss–Newton step grow with it.
MAX_FIT_LINES = 5000

#: Gauss–Newton iterations a fit from the web may take (the engine's default, kept for
#: `manage.py fit`, is 20).  A fit that has not converged in 10 was started too far from its
#: solution, and the page says so; each iteration solves the levels of every J the lines name.
FIT_MAX_ITERATIONS = 10

#: Highest J of an assigned line fitted from the web, by rotor kind.  Closed-form rotors take the
#: engine's own cap.  An asymmetric top's levels of one J cost an eigen-solve of (J+1)/2-sized Wang
#: blocks, and every iteration solves each J the lines name: measured on the 2-core machine
#: (2026-12-02), SO2 lines with random frequencies at every J up to 250 ran 50 s to the refusal
#: (J 0–250 take 1.1 s per solve when the machine is quiet, 8.5 s when it is busy), while up to
#: J = 150 a solve takes a seventh of that.  150 is past the J of most laboratory fits of
#: asymmetric tops (common practice, no source); `manage.py fit` keeps the engine's cap of 250.
FIT_J_CAPS = {
    "linear": CLOSED_FORM_J_CAP,
    "symmetric-prolate": CLOSED_FORM_J_CAP,
    "symmetric-oblate": CLOSED_FORM_J_CAP,
    "asymmetric": 150,
}

#: Largest lines CSV, uploaded or pasted [bytes].  1 MB holds some 15 000 lines, more than
#: MAX_FIT_LINES; anything bigger is the wrong file.
MAX_LINES_BYTES = 1024 * 1024

#: Longest single field of a lines CSV [characters]: a note or a source, never a page of text.
MAX_LINES_FIELD_CHARS = 1000

#: Largest catalogue file accepted by the import page [bytes].  A catalogue of a few hundred
#: species is well under it; anything bigger is a wrong file.
MAX_CATALOGUE_BYTES = 2 * 1024 * 1024

#: Most species in one imported catalogue file.  Every plan predicts every catalogue species for
#: its blend check, so the catalogue's size is part of every plan's cost.
MAX_IMPORT_SPECIES = 500

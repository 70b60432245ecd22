"""What the outputs say, as data: between sizing and render in the data flow (docs/design.md,
"How the code is built"). The cautions and assumption notes (notes), the candidates a sizing lists
(size) and the JSON documents in SI of forces, check, size, schedules and span tables (forces,
check, size, cost, schedule), numpy values made plain for JSON (jsonable). Sentences with numbers
are sizer.phrase phrases; render shows all of it in the display units of the run.
"""

"""The LibreOffice Calc front of the worksheet functions: an extension generated from the registry.

``names`` (how each function and argument is named inside Calc and in the files Calc saves, and
formulas in Calc's syntax), ``build`` (the ``.oxt``: interface, component, wizard texts),
``component`` (the file LibreOffice loads; it runs in LibreOffice's Python only), ``host`` (what
Calc hands over, cleaned as xlwings cleans it in Excel, and the results shaped for Calc),
``office`` (LibreOffice on this machine: its Python, installing, driving it), ``driver`` (runs in
LibreOffice's Python: a headless Calc doing the steps of a JSON job), ``check`` (the documented
examples in Calc against the Python call) and ``workbook`` (SF_ formulas of an ``.xlsx``
rewritten between Excel's and Calc's form). ``sheetfuncs calc`` is the command line for them.
"""

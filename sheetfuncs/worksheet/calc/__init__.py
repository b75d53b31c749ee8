"""The LibreOffice Calc front of the worksheet functions: an extension generated from the registry.

``names`` (how each function and argument is named inside Calc and in the files Calc saves).
"""

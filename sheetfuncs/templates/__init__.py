"""QA templates: workbooks with a data block and SF_ formulas, written ready and filled headless.
"""

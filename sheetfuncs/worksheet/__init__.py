"""worksheet"""

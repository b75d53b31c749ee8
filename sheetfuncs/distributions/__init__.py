"""dist"""
